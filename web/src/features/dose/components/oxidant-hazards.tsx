import type { OxidantId } from '@shared/redox';

/** General hazards of handling each oxidant, phrased generally: the site's own documents govern. */
const HAZARDS: Record<OxidantId, string[]> = {
  h2o2: [
    'Strong oxidiser. It decomposes to oxygen and heat, faster when warm, concentrated or contaminated — iron in the liquor speeds it up. Closed lines and vessels can build pressure.',
    'Contact with organic material or combustibles can start a fire. Corrosive to skin and eyes.',
  ],
  mno2: [
    'Fine dust: keep it out of the air and out of lungs while handling and slurrying (manganese).',
    'An oxidiser; it also adds manganese to the liquor, which downstream steps may have to handle.',
  ],
  o2: [
    'Oxygen enrichment makes materials — including clothing and some not normally combustible — catch fire easily and burn fiercely.',
    'Keep oil and grease off oxygen equipment, and watch for enriched air around spargers, vents and enclosed spaces.',
  ],
};

export function OxidantHazards({ oxidant, label }: { oxidant: OxidantId; label: string }) {
  return (
    <section aria-label={`Handling ${label}`} className="rounded-md border border-line bg-panel-2 p-3 text-sm">
      <h3 className="font-semibold">
        <span aria-hidden="true">! </span>Handling {label}
      </h3>
      <ul className="mt-1 list-disc pl-5">
        {HAZARDS[oxidant].map((h) => <li key={h}>{h}</li>)}
      </ul>
      <p className="mt-2 text-ink-muted">
        Follow the site procedures and the safety data sheet, and ask the qualified persons; exposure limits differ by jurisdiction.
      </p>
    </section>
  );
}
