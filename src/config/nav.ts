import { BookUser, FileSignature, House, Layers, Mails, NotebookPen, ScrollText, SlidersHorizontal, Tags, TreeDeciduous, Users, type LucideIcon } from 'lucide-react';
import { CalendarRange, ChartColumnBig, PackageSearch } from 'lucide-react';
import type { Role } from '@shared/schemas/auth';
import { paths } from './paths';

export interface NavItem {
  to: string;
  label: string;
  icon: LucideIcon;
  /** Roles that see this item; the server enforces the same on every route. */
  roles: readonly Role[];
}

const ALL: readonly Role[] = ['owner', 'estimator', 'sales', 'workshop'];

/** The navigation, in order. Each feature adds its entry here as it arrives. */
export const NAV: NavItem[] = [
  { to: paths.home, label: 'Overview', icon: House, roles: ALL },
  { to: paths.estimates, label: 'Estimates', icon: NotebookPen, roles: ALL },
  { to: paths.quotes, label: 'Quotes', icon: FileSignature, roles: ALL },
  { to: paths.outbox, label: 'Outbox', icon: Mails, roles: ['owner', 'sales'] },
  { to: paths.customers, label: 'Customers', icon: BookUser, roles: ALL },
  { to: paths.planning, label: 'Planning', icon: CalendarRange, roles: ALL },
  { to: paths.forecast, label: 'Forecast', icon: PackageSearch, roles: ['owner', 'workshop'] },
  { to: paths.actuals, label: 'Actuals', icon: ChartColumnBig, roles: ['owner'] },
  { to: paths.priceList, label: 'Price list', icon: Tags, roles: ALL },
  { to: paths.finishingSystems, label: 'Finishing systems', icon: Layers, roles: ['owner', 'estimator'] },
  { to: paths.species, label: 'Wood species', icon: TreeDeciduous, roles: ['owner', 'estimator'] },
  { to: paths.settings, label: 'Settings', icon: SlidersHorizontal, roles: ['owner'] },
  { to: paths.users, label: 'Users', icon: Users, roles: ['owner'] },
  { to: paths.auditLog, label: 'Audit log', icon: ScrollText, roles: ['owner'] },
];

export function navFor(role: Role): NavItem[] {
  return NAV.filter((item) => item.roles.includes(role));
}
