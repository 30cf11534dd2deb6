import { BookUser, HandCoins, FileSignature, House, Layers, Mails, NotebookPen, ScrollText, SlidersHorizontal, Tags, TreeDeciduous, Users, type LucideIcon } from 'lucide-react';
import { CalendarRange, ChartColumnBig, ChartLine, Package, PackageSearch, MessageSquareText } from 'lucide-react';
import { allows, type Access } from '@shared/roles';
import type { Role } from '@shared/schemas/auth';
import { paths } from './paths';

export interface NavItem {
  to: string;
  label: string;
  icon: LucideIcon;
  /** Who sees this item: a permission of shared/roles.ts (the server enforces the same), or every signed-in user. */
  access: Exclude<Access, 'public'>;
}

/** The navigation, in order. Each feature adds its entry here as it arrives. */
export const NAV: NavItem[] = [
  { to: paths.home, label: 'Overview', icon: House, access: 'signed-in' },
  { to: paths.estimates, label: 'Estimates', icon: NotebookPen, access: 'signed-in' },
  { to: paths.quotes, label: 'Quotes', icon: FileSignature, access: 'signed-in' },
  { to: paths.outbox, label: 'Outbox', icon: Mails, access: 'sendQuotes' },
  { to: paths.owed, label: 'Owed to us', icon: HandCoins, access: 'takePayments' },
  { to: paths.customers, label: 'Customers', icon: BookUser, access: 'signed-in' },
  { to: paths.planning, label: 'Planning', icon: CalendarRange, access: 'signed-in' },
  { to: paths.forecast, label: 'Forecast', icon: PackageSearch, access: 'readForecast' },
  { to: paths.stock, label: 'Stock', icon: Package, access: 'keepStock' },
  { to: paths.actuals, label: 'Actuals', icon: ChartColumnBig, access: 'reviewActuals' },
  { to: paths.reports, label: 'Reports', icon: ChartLine, access: 'readReports' },
  { to: paths.priceList, label: 'Price list', icon: Tags, access: 'readPriceList' },
  { to: paths.finishingSystems, label: 'Finishing systems', icon: Layers, access: 'readFinishing' },
  { to: paths.species, label: 'Wood species', icon: TreeDeciduous, access: 'readFinishing' },
  { to: paths.settings, label: 'Settings', icon: SlidersHorizontal, access: 'editSettings' },
  { to: paths.messageTemplates, label: 'Messages to customers', icon: MessageSquareText, access: 'readMessages' },
  { to: paths.users, label: 'Users', icon: Users, access: 'manageUsers' },
  { to: paths.auditLog, label: 'Audit log', icon: ScrollText, access: 'readAuditLog' },
];

export function navFor(role: Role): NavItem[] {
  return NAV.filter((item) => allows(item.access, role));
}
