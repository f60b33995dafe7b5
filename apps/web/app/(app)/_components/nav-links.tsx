'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { useState } from 'react';
import type { NavGroup } from '~/lib/navigation';

export interface NavLinkItem {
  href: string;
  label: string;
  group?: NavGroup;
}

/** Consecutive items of one group, in the order given; Home (no group) stands alone. */
function grouped(items: NavLinkItem[]) {
  const groups: { name: NavGroup | null; items: NavLinkItem[] }[] = [];
  for (const item of items) {
    const last = groups.at(-1);
    if (last && last.name === (item.group ?? null)) last.items.push(item);
    else groups.push({ name: item.group ?? null, items: [item] });
  }
  return groups;
}

/**
 * The side rail's sections, grouped under small headings. Below the large breakpoint the rail
 * folds into a "Sections" button that opens the same list; following a link closes it.
 */
export function NavLinks({ items }: { items: NavLinkItem[] }) {
  const pathname = usePathname();
  const [open, setOpen] = useState(false);
  // The longest section path the page is under: /settings/people is People, not Settings.
  const current = items
    .filter((i) => (i.href === '/' ? pathname === '/' : pathname.startsWith(i.href)))
    .reduce<string | null>(
      (best, i) => (!best || i.href.length > best.length ? i.href : best),
      null,
    );
  return (
    <>
      <button
        type="button"
        aria-expanded={open}
        aria-controls="section-links"
        onClick={() => setOpen((o) => !o)}
        className="inline-flex min-h-11 items-center gap-2 rounded-md border border-sea-500 px-3 font-medium text-white hover:bg-sea-700 lg:hidden"
      >
        <svg viewBox="0 0 20 20" className="size-5" aria-hidden="true" focusable="false">
          <path d="M3 5h14M3 10h14M3 15h14" stroke="currentColor" strokeWidth="2" />
        </svg>
        Sections
      </button>
      <nav
        id="section-links"
        aria-label="Sections"
        className={`${open ? 'block' : 'hidden'} order-last w-full lg:order-none lg:block`}
      >
        {grouped(items).map((group) => (
          <div key={group.name ?? 'top'} className="mt-3 first:mt-0">
            {group.name && (
              <p className="px-3 pb-1 text-xs font-semibold tracking-wide text-sea-200 uppercase">
                {group.name}
              </p>
            )}
            <ul className="space-y-0.5">
              {group.items.map((item) => {
                const active = item.href === current;
                return (
                  <li key={item.href}>
                    <Link
                      href={item.href}
                      aria-current={active ? 'page' : undefined}
                      onClick={() => setOpen(false)}
                      className="flex min-h-11 items-center rounded-md px-3 font-medium text-sea-50 hover:bg-sea-700 aria-[current=page]:bg-sea-900 aria-[current=page]:text-brass-200"
                    >
                      {item.label}
                    </Link>
                  </li>
                );
              })}
            </ul>
          </div>
        ))}
      </nav>
    </>
  );
}
