import { demoDomain } from '@/db/seed/demo-names';

/**
 * Invented names for the scale dataset: more producer groups of the same valley, their farms, and one
 * supplier account per group that has none in the demo. Farm names are built from invented syllables,
 * so two hundred of them stay distinct and clearly fictitious.
 */
export const scaleSupplierGroups = [
  { name: 'Swale Fold Dairy Farmers', prefix: 'SF', contactEmail: `office.swalefold@${demoDomain}` },
  { name: 'Crummock Edge Milk Producers', prefix: 'CE', contactEmail: `office.crummockedge@${demoDomain}` },
  { name: 'Ravenmoss Grazing Cooperative', prefix: 'RM', contactEmail: `office.ravenmoss@${demoDomain}` },
  { name: 'Lowther Beck Herd Owners', prefix: 'LB', contactEmail: `office.lowtherbeck@${demoDomain}` },
  { name: 'Hagg Wood Producers’ Circle', prefix: 'HW', contactEmail: `office.haggwood@${demoDomain}` },
] as const;

/** One supplier account per producer group without one in the demo (index into all supplier groups, demo first). */
export const scaleSupplierUsers = [
  { group: 2, name: 'Hester Gillamore', email: `supplier3@${demoDomain}` },
  { group: 3, name: 'Oswin Tarrowby', email: `supplier4@${demoDomain}` },
  { group: 4, name: 'Maren Bleaswick', email: `supplier5@${demoDomain}` },
  { group: 5, name: 'Edric Hollowmere', email: `supplier6@${demoDomain}` },
  { group: 6, name: 'Wenna Crostholm', email: `supplier7@${demoDomain}` },
  { group: 7, name: 'Idris Fawnsett', email: `supplier8@${demoDomain}` },
] as const;

const heads = ['Brack', 'Sill', 'Grey', 'Ash', 'Fell', 'Wren', 'Cobb', 'Thorn', 'Lark', 'Rowan', 'Moss', 'Stone', 'Gilly', 'Hazel', 'Tarn', 'Birk'];
const tails = ['rigg', 'foot', 'howe', 'mire', 'croft', 'garth', 'beck', 'syke', 'ghyll', 'dene'];

/** The n-th invented farm name (0-based), distinct for n < 160. */
export function scaleFarmName(n: number): string {
  const head = heads[n % heads.length];
  const tail = tails[Math.floor(n / heads.length) % tails.length];
  return `${head}${tail} Farm`;
}
