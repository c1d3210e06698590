import { SAFETY_CAUTIONS, type EstimateResult, type SafetySummary } from '@/lib/circuit';
import { formatReading } from '@/lib/editor/format';

/** Our deferral, shown under every set of safety figures. */
export const DEFER_TO_CODES =
  'These are screening figures from a design tool, not a safety approval. Local electrical codes, the product standards that apply to your equipment and a qualified, licensed practitioner decide whether a high-voltage supply is safe to build, test and operate.';

function Figure({ label, value, tone = 'text-ink-100' }: { label: string; value: string; tone?: string }) {
  return (
    <>
      <dt className="text-ink-400">{label}</dt>
      <dd className={`text-right font-mono ${tone}`}>{value}</dd>
    </>
  );
}

/**
 * Stored energy, each output's stack charge and energy, the discharge path and its time to
 * 60 V, the bleeder that would reach 60 V within 5 s, the warnings, and the cautions. Before the
 * solve arrives the estimate's no-load figures are shown, marked as such.
 */
export function SafetySection({ safety, estimate, nodeLabels }: { safety: SafetySummary | null; estimate: EstimateResult | null; nodeLabels: Record<string, string> }) {
  const cautions = safety?.cautions ?? SAFETY_CAUTIONS;
  const hazardousNodes = safety ? Object.values(safety.nodes).filter((c) => c.hazardousLive).length : null;
  return (
    <div className="space-y-2 text-xs" data-testid="safety-section">
      {safety ? (
        <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5">
          <Figure label="Energy in all capacitors" value={formatReading(safety.totalEnergyJ, 'J')} tone="text-copper-100" />
          {hazardousNodes !== null ? <Figure label="Nodes hazardous live if touched" value={`${hazardousNodes} of ${Object.keys(safety.nodes).length}`} /> : null}
        </dl>
      ) : estimate ? (
        <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5">
          <Figure label="Energy in all capacitors (estimate, no load)" value={formatReading(estimate.storedEnergyJ, 'J')} tone="text-copper-100" />
          <Figure label="Output stack energy (estimate)" value={formatReading(estimate.outputEnergyJ, 'J')} />
          <Figure label="Output stack charge (estimate)" value={formatReading(estimate.outputChargeC, 'C')} />
          <dt className="col-span-2 text-ink-400">Discharge path and bleeder figures arrive with the solve.</dt>
        </dl>
      ) : (
        <p className="text-ink-400">No figures yet.</p>
      )}
      {safety?.outputs.map((o) => (
        <div key={o.node} className="rounded border border-copper-800 bg-copper-800/10 p-2" data-testid="safety-output" data-node={o.node}>
          <p className="mb-1 font-semibold text-copper-100">
            {nodeLabels[o.node] ?? o.node} · {formatReading(o.voltageV, 'V')}
          </p>
          <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5">
            <Figure label="Smoothing stack seen from the output" value={formatReading(o.stackCapacitanceF, 'F')} />
            <Figure label="Stack charge" value={formatReading(o.stackChargeC, 'C')} />
            <Figure label="Stack energy" value={formatReading(o.stackEnergyJ, 'J')} />
            <Figure
              label="Discharge resistance to ground"
              value={o.dischargeResistanceOhm !== null ? formatReading(o.dischargeResistanceOhm, 'Ω') : 'none'}
              tone={o.dischargeResistanceOhm === null ? 'text-hazard-100' : 'text-ink-100'}
            />
            {o.dischargeResistors.length > 0 ? <Figure label="Through" value={o.dischargeResistors.join(', ')} /> : null}
            {o.discharge ? (
              <>
                <Figure label="Time constant τ" value={formatReading(o.discharge.tauS, 's')} />
                <Figure label="Time to 60 V after switch-off" value={formatReading(o.discharge.toSafeVoltageS, 's')} tone={o.discharge.toSafeVoltageS > 5 ? 'text-hazard-100' : 'text-lagoon-100'} />
              </>
            ) : (
              <Figure label="Time to 60 V after switch-off" value="never (no resistive path)" tone="text-hazard-100" />
            )}
            <Figure label="Bleeder for 60 V within 5 s, at most" value={formatReading(o.bleederFor5s.maxResistanceOhm, 'Ω')} />
            <Figure label="Its current / dissipation" value={`${formatReading(o.bleederFor5s.currentA, 'A', 3)} / ${formatReading(o.bleederFor5s.powerW, 'W', 3)}`} />
          </dl>
          {o.warnings.length > 0 ? (
            <ul className="mt-1 space-y-0.5" data-testid="safety-warnings">
              {o.warnings.map((w) => (
                <li key={w.code} className="text-hazard-100">
                  <span aria-hidden="true">⚠ </span>
                  {w.message}
                  <span className="block pl-3 text-[10px] text-ink-400">basis: {w.basis}</span>
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ))}
      <div className="rounded border border-hazard-700 bg-hazard-700/15 p-2" data-testid="safety-cautions">
        <p className="mb-1 font-semibold text-hazard-100">Cautions</p>
        <ul className="list-disc space-y-0.5 pl-4 text-ink-100">
          {cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
        <p className="mt-1.5 text-ink-200">{DEFER_TO_CODES}</p>
      </div>
    </div>
  );
}
