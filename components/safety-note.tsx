/** The standing caution shown wherever a client moves on camera or practises. */
export function SafetyNote({ compact = false }: { compact?: boolean }) {
  return (
    <aside role="note" className="rounded-card border border-flag-amber/30 bg-flag-amberBg p-4 text-sm text-ink">
      <p className="font-semibold text-flag-amber">Move within comfort</p>
      <p className="mt-1">
        Stop and tell your therapist if pain, swelling, numbness or a change of colour comes on or gets worse. Follow
        your surgeon&apos;s instructions first; never push against resistance unless your therapist has said you may.
      </p>
      {compact ? null : (
        <p className="mt-1 text-ink-soft">
          Kinarc helps your therapist measure movement. It does not diagnose and does not replace their advice.
        </p>
      )}
    </aside>
  );
}
