// Where each limited stock goes in the plan while it lasts: a table and a stacked bar chart (loaded
// with the charts, lazily).
import { useEffect } from 'react';
import type { LinePlanOptimal } from '../../core/lineplan/plan';
import { AllocationChart, useWidth } from '../../components/charts';
import { overPeriod, quantityNumber, type PlanView } from './words';

export interface AllocationPanelProps {
  plan: LinePlanOptimal;
  view: PlanView;
}

export default function AllocationPanel({ plan, view }: AllocationPanelProps) {
  const { fmt, limited, supplyKg, code, period, unit } = view;
  const [ref, width] = useWidth<HTMLDivElement>(640);
  const rows = limited.map((id) => {
    const use = plan.stockUse.find((u) => u.id === id);
    const byGrade = use ? use.byGrade : plan.grades.map(() => 0);
    const total = byGrade.reduce((s, x) => s + x, 0);
    return { id, byGrade, total, supplyKg: supplyKg[id] ?? null };
  });
  const t = (kg: number) => quantityNumber(fmt, unit, kg);
  /** kg per unit shown. */
  const per = unit === 't' ? 1000 : 1;
  return (
    <section className="panel lp-allocation" aria-labelledby="lp-alloc-h">
      <h3 id="lp-alloc-h">Where the limited stocks go (while they last, {overPeriod(period)})</h3>
      <div className="table-scroll">
        <table className="data" data-testid="allocation-table">
          <thead>
            <tr>
              <th scope="col">Stock</th>
              {plan.grades.map((g) => (
                <th key={g.id} scope="col" className="num">
                  {g.label} [{unit}]
                </th>
              ))}
              <th scope="col" className="num">
                Used [{unit}]
              </th>
              <th scope="col" className="num">
                Supply [{unit}]
              </th>
              <th scope="col" className="num">
                Not needed [{unit}]
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <th scope="row" className="code">
                  {code(r.id)}
                </th>
                {r.byGrade.map((kg, k) => (
                  <td key={k} className="num">
                    {kg > 0 ? t(kg) : '—'}
                  </td>
                ))}
                <td className="num">{t(r.total)}</td>
                <td className="num">{r.supplyKg === null ? 'not given' : t(r.supplyKg)}</td>
                <td className="num">{r.supplyKg === null ? '—' : t(Math.max(0, r.supplyKg - r.total))}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div ref={ref}>
        <AllocationChart
          title={`${unit === 't' ? 'Tonnes' : 'Kilograms'} of each limited stock by grade`}
          rows={rows.map((r) => ({
            label: code(r.id),
            amounts: r.byGrade.map((kg) => kg / per),
            unused: r.supplyKg === null ? 0 : Math.max(0, r.supplyKg - r.total) / per,
          }))}
          series={plan.grades.map((g) => g.label)}
          unit={unit}
          digits={unit === 't' ? 1 : 0}
          width={Math.max(320, Math.min(width, 900))}
        />
      </div>
    </section>
  );
}

/**
 * The chart drawn once, out of sight and out of reach (inert, hidden from assistive technology),
 * while the user is still entering the plan, then removed: the chart library's first draw (code
 * compiled, its store set up) is then done before the first "Plan the line", so the first result
 * shows as fast as the next ones.
 */
export function ChartWarmUp({ onDone }: { onDone: () => void }) {
  useEffect(() => {
    // The chart library draws its bars in a later pass than its first commit: leave it a moment.
    const id = setTimeout(onDone, 300);
    return () => clearTimeout(id);
  }, [onDone]);
  return (
    <div className="lp-warm-up" aria-hidden="true" inert>
      <AllocationChart title="" rows={[{ label: 'A', amounts: [1, 1], unused: 1 }]} series={['a', 'b']} unit="t" width={320} />
    </div>
  );
}
