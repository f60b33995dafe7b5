import { describe, expect, it } from 'vitest';
import { navFor } from './navigation';

const labels = (...args: Parameters<typeof navFor>) => navFor(...args).map((item) => item.label);

describe('navigation per role', () => {
  it('auditor – sees Home and Audits, never a shop page or the network', () => {
    expect(labels('auditor', null)).toEqual(['Home', 'Audits']);
  });

  it('technician – gets their shop page beside the bench', () => {
    expect(labels('technician', 4)).toEqual(['Home', 'Shop', 'Bench', 'Comebacks']);
    expect(navFor('technician', 4)[1]).toMatchObject({ href: '/shops/4' });
  });

  it('owner – sees the network and caught mail where a catcher runs', () => {
    const items = labels('owner', null, { mailCatcher: true });
    expect(items).toContain('Network');
    expect(items).not.toContain('Shop');
    expect(items.at(-1)).toBe('Caught mail');
  });
});
