'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';

export function NavLinks({ items }: { items: { href: string; label: string }[] }) {
  const pathname = usePathname();
  return (
    <ul className="flex flex-wrap gap-1">
      {items.map((item) => {
        const active = item.href === '/' ? pathname === '/' : pathname.startsWith(item.href);
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              aria-current={active ? 'page' : undefined}
              className="inline-flex min-h-11 items-center rounded-md px-3 font-medium text-sea-50 hover:bg-sea-700 aria-[current=page]:bg-sea-900 aria-[current=page]:text-brass-200"
            >
              {item.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
