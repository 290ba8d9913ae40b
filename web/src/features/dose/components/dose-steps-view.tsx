import type { DoseStep } from '../utils/dose-steps';

/** The arithmetic laid out line by line, so it can be checked by hand. */
export function DoseStepsView({ title, steps }: { title: string; steps: DoseStep[] }) {
  return (
    <table className="w-full text-left text-sm" aria-label={title}>
      <caption className="pb-1 text-left font-semibold">{title}</caption>
      <tbody>
        {steps.map((s, i) => (
          <tr key={s.label} className="border-t border-line align-top">
            <td className="w-6 py-1.5 pr-2 text-ink-muted tabular-nums">{i + 1}.</td>
            <th scope="row" className="py-1.5 pr-3 font-semibold">{s.label}</th>
            <td className="py-1.5 pr-3 font-mono text-xs text-ink-muted">{s.working}</td>
            <td className="py-1.5 text-right font-semibold whitespace-nowrap tabular-nums">{s.result}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
