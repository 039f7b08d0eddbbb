/** The invented demo scenario: a river valley, its cooperative dairy, three producer groups and their farms. */
export const demoDomain = 'demo.countersample.test';

export const demoOrganisations = {
  plant: { name: 'Larchwater Valley Dairy Cooperative', kind: 'plant', contactEmail: `intake@${demoDomain}` },
  lab: { name: 'Eskmere Regional Dairy Laboratory', kind: 'lab', contactEmail: `reception@${demoDomain}` },
  board: { name: 'Larch Valley Milk Quality Board', kind: 'board', contactEmail: `secretary@${demoDomain}` },
  suppliers: [
    { name: 'Upper Larch Producers’ Group', kind: 'supplier', contactEmail: `office.upperlarch@${demoDomain}`, prefix: 'UL', farms: 16 },
    { name: 'Hollin Brook Farms Association', kind: 'supplier', contactEmail: `office.hollinbrook@${demoDomain}`, prefix: 'HB', farms: 14 },
    { name: 'Tarn Meadow Milk Group', kind: 'supplier', contactEmail: `office.tarnmeadow@${demoDomain}`, prefix: 'TM', farms: 10 },
  ],
} as const;

export const demoFarmNames = [
  'Brackenrigg', 'Low Sillfoot', 'Greystone Howe', 'Ashby Mire', 'Fellside Croft', 'Wrenhill', 'Cobble Garth', 'Thornbeck',
  'High Larchet', 'Rowan Lea', 'Mossburn', 'Stonecroft End', 'Gillymoor', 'Hazel Dene', 'Tarnside', 'Birkett Hall',
  'Nether Hollin', 'Brookwood', 'Kestrel Bank', 'Shieling Farm', 'Cragfoot', 'Ellerby', 'Middle Ghyll', 'Foxglove Holme',
  'Beckstones', 'Ullock', 'Sedge Flat', 'Ravenscar Barn', 'Willow Carr', 'Harebell', 'Old Meadow', 'Pike Howe',
  'Lindeth', 'Summerhill', 'Coldwell', 'Heron Syke', 'Glebe Farm', 'Mirefold', 'Tewit Hall', 'Blackthorn',
] as const;

export const demoUsers = [
  { key: 'admin', email: `admin@${demoDomain}`, name: 'Morag Ellery', role: 'admin', org: 'board' },
  { key: 'plant', email: `plant@${demoDomain}`, name: 'Tomas Fenwick', role: 'plant', org: 'plant' },
  { key: 'lab', email: `lab@${demoDomain}`, name: 'Ines Halloran', role: 'lab', org: 'lab' },
  { key: 'arbiter', email: `arbiter@${demoDomain}`, name: 'Ruth Oakenshaw', role: 'arbiter', org: 'board' },
  { key: 'arbiter2', email: `arbiter2@${demoDomain}`, name: 'Callum Dunnerdale', role: 'arbiter', org: 'board' },
  { key: 'supplier', email: `supplier@${demoDomain}`, name: 'Gareth Pennock', role: 'supplier', org: 0 },
  { key: 'supplier2', email: `supplier2@${demoDomain}`, name: 'Alys Marrow', role: 'supplier', org: 1 },
] as const;
