/**
 * Reports over quotes: the pipeline by state (as read today) and which option customers take.
 */
import { quoteStateSql } from '../quote-expiry';
import { QueryTypes, type Sequelize } from 'sequelize';
import { type PipelineRow, type OptionReport, type QuoteState } from '@shared/schemas/quotes';

export async function pipeline(sequelize: Sequelize): Promise<PipelineRow[]> {
  const rows = await sequelize.query<{ state: QuoteState; currency: string; count: string; value: string }>(
    `SELECT ${quoteStateSql()} AS state, currency, count(*) AS count, coalesce(sum(coalesce(accepted_total, total)), 0)::numeric(14,2)::text AS value
       FROM quotes WHERE state <> 'withdrawn' GROUP BY 1, currency ORDER BY 1, currency`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ state: r.state, currency: r.currency, count: Number(r.count), value: r.value }));
}

/**
 * Which option customers take: for every option group (two lines or more) of an accepted quote, whether the lighter
 * option (the cheaper line; the first of equals) was taken, a heavier one, none (an optional group), and whether the
 * recommended one was taken.
 */
export async function optionReport(sequelize: Sequelize): Promise<OptionReport> {
  const rows = await sequelize.query<{ quote_id: number; option_group: number; month: string; id: number; total: string; chosen: boolean | null; recommended: boolean; position: number }>(
    `SELECT l.quote_id, l.option_group, to_char(q.accepted_at, 'YYYY-MM') AS month, l.id, l.total::text AS total, l.chosen, l.recommended, l.position
       FROM quote_lines l JOIN quotes q ON q.id = l.quote_id
      WHERE q.state IN ('accepted', 'deposit-paid')
        AND (l.quote_id, l.option_group) IN (SELECT quote_id, option_group FROM quote_lines GROUP BY quote_id, option_group HAVING count(*) > 1)
      ORDER BY q.accepted_at, l.quote_id, l.option_group, l.position`,
    { type: QueryTypes.SELECT },
  );
  const out: OptionReport = { groups: 0, lighterChosen: 0, heavierChosen: 0, noneChosen: 0, recommendedChosen: 0, months: [] };
  const groups = new Map<string, typeof rows>();
  for (const r of rows) {
    const key = `${r.quote_id}/${r.option_group}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  for (const of of groups.values()) {
    const lighter = [...of].sort((a, b) => Number(a.total) - Number(b.total) || a.position - b.position)[0]!;
    const taken = of.find((l) => l.chosen);
    out.groups += 1;
    if (!taken) out.noneChosen += 1;
    else if (taken.id === lighter.id) out.lighterChosen += 1;
    else out.heavierChosen += 1;
    if (taken?.recommended) out.recommendedChosen += 1;
    const month = of[0]!.month;
    let m = out.months.find((x) => x.month === month);
    if (!m) out.months.push((m = { month, groups: 0, lighterChosen: 0 }));
    m.groups += 1;
    if (taken && taken.id === lighter.id) m.lighterChosen += 1;
  }
  return out;
}
