import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { referenceById } from '@shared/redox';
import type { TankSummary } from '@shared/schemas/plant';
import { BandBar } from '../../../components/ui/band-bar';
import { BandState } from '../../../components/ui/band-state';
import { FreshnessLabel } from '../../../components/ui/freshness-label';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { Quantity } from '../../../components/ui/quantity';
import { formatDate, formatDateTime, formatEhV, formatFixed, formatMv, formatMvRange, formatRatio, formatTempC } from '../../../lib/format';
import type { FreshnessView } from '../../../lib/freshness';
import { bandAsMv, bandPosition, uncertaintyFactor } from '../../../lib/redox-view';
import { useTankAlarm, useTankSilencedAlarms } from '../../../lib/tank-alarms';

export const MIXED_POTENTIAL_CAVEAT =
  'ORP in real slurries is a mixed potential; the ratio is an estimate validated by lab assays.';

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="border-t border-line pt-3">
      <h2 className="mb-2 text-sm font-bold uppercase tracking-wide text-ink-muted">{title}</h2>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1.5 text-sm">{children}</dl>
    </section>
  );
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <>
      <dt className="text-ink-muted">{label}</dt>
      <dd className="text-right">{children}</dd>
    </>
  );
}

function publishedReference(id: string) {
  try {
    return referenceById(id);
  } catch {
    return null;
  }
}

type Props = { tank: TankSummary; timeZone: string; freshness: FreshnessView; alarmsHref?: string; definitionsHref?: string };

export function TankFacts({ tank, timeZone, freshness, alarmsHref, definitionsHref }: Props) {
  const { probe, calibration, latest, band } = tank;
  const alarm = useTankAlarm(tank.id);
  const silenced = useTankSilencedAlarms(tank.id);
  const tempC = latest?.tempC;
  const bandMv = bandAsMv(band, probe, calibration, tempC);
  const factor = uncertaintyFactor(probe, tempC);
  const stale = freshness.stale;
  const position = latest ? bandPosition(latest.ratio, band) : null;
  const published = probe ? publishedReference(probe.referenceId) : null;

  return (
    <div className="flex flex-col gap-4">
      <section aria-label="Latest values" className="flex flex-col gap-2" data-testid="tank-latest">
        <div className="flex items-baseline gap-2">
          <span className={`text-5xl font-bold tabular-nums ${stale ? 'text-offline-ink line-through' : ''}`}>{formatRatio(latest?.ratio)}</span>
          <span className="text-ink-muted">Fe³⁺/Fe²⁺</span>
          <span className="ml-auto">{tank.offline ? <span className="text-offline-ink">Out of service</span> : position && !stale && <BandState position={position} priority={alarm?.priority} />}</span>
        </div>
        <BandBar band={band} ratio={latest?.ratio ?? null} factor={factor} attention={!stale && position != null && position !== 'in' ? (alarm?.priority ?? null) : null} muted={stale} aspect={18} />
        {latest && (
          <dl className="grid grid-cols-4 gap-2 text-sm">
            {[
              ['ORP', formatMv(latest.orpMv), 'mV'],
              ['Eh', formatEhV(latest.ehV), 'V'],
              ['Temp', formatTempC(latest.tempC), '°C'],
              ['Fe³⁺ share', formatFixed(latest.ferricFraction * 100, 0), '%'],
            ].map(([label, value, unit]) => (
              <div key={label}>
                <dt className="text-ink-muted">{label}</dt>
                <dd>
                  <Quantity value={value} unit={unit} struck={stale} className="text-lg" />
                </dd>
              </div>
            ))}
          </dl>
        )}
        <FreshnessLabel freshness={freshness} className="text-sm" />
        {latest?.flag === 'outside-range' && (
          <p className="text-sm font-semibold text-attention-3-ink">
            <span aria-hidden="true">◆ </span>Outside calibrated range: the ratio is clamped; check the probe.
          </p>
        )}
        {latest?.flag === 'probe-suspect' && (
          <p className="text-sm font-semibold text-attention-2-ink" data-testid="probe-suspect">
            <span aria-hidden="true">▲ </span>Probe suspect: it failed its last check against a standard solution. Its readings are marked until it
            passes a check or is replaced.
          </p>
        )}
        {latest?.flag === 'reference-extrapolated' && (
          <p className="text-sm font-semibold text-attention-3-ink" data-testid="reference-flag">
            <span aria-hidden="true">◆ </span>Reference electrode extrapolated: {formatTempC(latest.tempC)} °C is outside the temperatures its
            published data covers, so the ratio is less certain. Enter the probe maker's table if you have it.
          </p>
        )}
        {latest?.flag === 'reference-unusable' && (
          <p className="text-sm font-semibold text-attention-1-ink" data-testid="reference-flag">
            <span aria-hidden="true">◆ </span>Reference electrode above its usable temperature ({formatTempC(latest.tempC)} °C; calomel is not used
            above about 70 °C, common practice): do not trust this ratio.
          </p>
        )}
      </section>

      <Section title="Band">
        <Fact label="Ratio">
          <Quantity value={`${formatRatio(band.low)} to ${formatRatio(band.high)}`} />
          {band.target != null && <span className="text-ink-muted"> · target {formatRatio(band.target)}</span>}
        </Fact>
        <Fact label={tempC != null ? `mV at ${formatTempC(tempC)} °C` : 'mV'}>
          {bandMv ? <Quantity value={formatMvRange(bandMv.lowMv, bandMv.highMv)} unit="mV" /> : '—'}
        </Fact>
        <Fact label="Uncertainty">
          {probe && factor ? (
            <span>
              ±{formatFixed(probe.toleranceMv, 0)} mV → ratio ×/÷ {factor.toFixed(2)}
            </span>
          ) : (
            '—'
          )}
        </Fact>
      </Section>

      <Section title="Probe">
        {probe ? (
          <>
            <Fact label="Tag">{probe.tag}</Fact>
            <Fact label="Reference">{probe.referenceLabel}</Fact>
            <Fact label="Value used">
              <Quantity value={formatFixed(probe.referenceE25V, 4)} unit="V vs SHE at 25 °C" />
            </Fact>
            <Fact label="Coefficient">
              <Quantity value={formatFixed(probe.referenceCoeffVPerK * 1000, 2)} unit="mV/K" />
            </Fact>
            {published && (published.e25V !== probe.referenceE25V || published.coeffVPerK !== probe.referenceCoeffVPerK) && (
              <Fact label="Table value">
                <span className="text-ink-muted">
                  {formatFixed(published.e25V, 4)} V, {formatFixed(published.coeffVPerK * 1000, 2)} mV/K
                </span>
              </Fact>
            )}
            <Fact label="Tolerance">
              <Quantity value={`±${formatFixed(probe.toleranceMv, 0)}`} unit="mV" />
            </Fact>
            <Fact label="Reports every">
              <Quantity value={String(probe.intervalS)} unit="s" />
            </Fact>
            <Fact label="Installed">{formatDate(probe.installedAt, timeZone)}</Fact>
          </>
        ) : (
          <Fact label="Probe">None fitted</Fact>
        )}
      </Section>

      <Section title="Calibration">
        {calibration ? (
          <>
            <Fact label="Version">
              {calibration.version}
              {latest && latest.calibrationVersion !== calibration.version && (
                <span className="text-ink-muted"> (newest reading used v{latest.calibrationVersion})</span>
              )}
            </Fact>
            <Fact label="E°′ at 25 °C">
              <Quantity value={formatFixed(calibration.formalPotentialV, 4)} unit="V vs SHE" />
            </Fact>
            <Fact label="Coefficient">
              <Quantity value={formatFixed(calibration.formalCoeffVPerK * 1000, 3)} unit="mV/K" />
            </Fact>
            <Fact label="Slope efficiency">
              <Quantity value={formatFixed(calibration.slopeEfficiency * 100, 1)} unit="%" />
              {calibration.slopeEfficiency === 1 && <span className="text-ink-muted"> (full Nernst slope)</span>}
            </Fact>
            <Fact label="Valid from">{formatDateTime(calibration.validFrom, timeZone)}</Fact>
            <Fact label="Reason">
              <span className="text-left">{calibration.reason}</span>
            </Fact>
          </>
        ) : (
          <Fact label="Calibration">None yet</Fact>
        )}
      </Section>

      <Section title="Active alarms">
        <Fact label={alarm ? (alarm.count > 1 ? `Worst of ${alarm.count}` : 'Open') : 'Alarms'}>
          {alarm ? (
            <span className="inline-flex items-center gap-2" data-testid="tank-alarm">
              <PriorityPill priority={alarm.priority} pulse={alarm.unacknowledged > 0} />
              <span>{alarm.label}</span>
              {alarm.unacknowledged > 0 && <span className="font-semibold">not acknowledged</span>}
            </span>
          ) : (
            <span className="text-ink-muted">{silenced > 0 ? 'None sounding' : 'None active'}</span>
          )}
        </Fact>
        {silenced > 0 && (
          <Fact label="Not sounding">
            <span data-testid="tank-silenced">{silenced === 1 ? '1 shelved, suppressed or out of service' : `${silenced} shelved, suppressed or out of service`}</span>
          </Fact>
        )}
        {alarmsHref && (
          <Fact label="">
            <Link to={alarmsHref} className="text-info-ink underline">
              {alarm ? 'Open on the Alarm desk' : 'Alarm history on the Alarm desk'}
            </Link>
          </Fact>
        )}
        {definitionsHref && (
          <Fact label="">
            <Link to={definitionsHref} className="text-info-ink underline">
              Alarm definitions: limits, delays, what to do
            </Link>
          </Fact>
        )}
      </Section>

      <p className="border-t border-line pt-3 text-sm text-ink-muted">{MIXED_POTENTIAL_CAVEAT}</p>
    </div>
  );
}
