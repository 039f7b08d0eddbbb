import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { Pager } from '@/components/ui/pager';

const text = (html: string) => html.replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ').trim();

describe('the pager', () => {
  it('gives the exact count and the last page of a list counted to the end', () => {
    const html = renderToStaticMarkup(<Pager page={2} pageSize={25} total={60} basePath="/deliveries" params={{ verdict: 'rejected' }} />);
    expect(text(html)).toContain('26–50 of 60');
    expect(text(html)).toContain('Page 2 of 3');
    expect(html).toContain('href="/deliveries?verdict=rejected&amp;page=3"');
    expect(html).not.toContain('more than');
  });

  it('says "more than" of a list whose count stopped at the cap, and still pages on', () => {
    const html = renderToStaticMarkup(<Pager page={1} pageSize={25} total={5000} moreThanTotal basePath="/deliveries" params={{}} />);
    expect(text(html)).toContain('1–25 of more than 5,000');
    expect(text(html)).toContain('Page 1 of 200+');
    expect(text(html)).toContain('Narrow the list by farm or verdict');
    expect(html).toContain('href="/deliveries?page=2"');
  });

  it('has nothing to show for an empty list, and no next page', () => {
    const html = renderToStaticMarkup(<Pager page={1} pageSize={25} total={0} basePath="/deliveries" params={{}} />);
    expect(text(html)).toContain('Nothing to show');
    expect(html).not.toContain('page=2');
  });
});
