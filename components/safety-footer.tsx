/** The persistent high-voltage caution shown at the foot of every page. */
export function SafetyFooter() {
  return (
    <footer className="border-t border-ink-800 bg-ink-900 px-6 py-3 text-xs text-ink-400" data-testid="safety-footer">
      <p className="mx-auto flex max-w-6xl items-start gap-2">
        <span aria-hidden="true" className="mt-px font-bold text-copper-400">
          ⚡
        </span>
        <span>
          <strong className="font-semibold text-copper-400">High voltage can kill.</strong> A ladder multiplier stores charge
          long after the drive is off. Kilorung helps you reason about a design; it does not approve one. Build and test
          only under your local electrical codes and with qualified, licensed people.
        </span>
      </p>
    </footer>
  );
}
