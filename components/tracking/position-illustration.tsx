import type { CameraView, Condition } from "@/lib/motions/catalog";

/**
 * A small drawing of the set-up: the forearm resting on a table seen from the side, where the camera goes, and which
 * way the hand moves (up, against gravity; or along the table, with gravity minimized). Kinarc's own simple shapes.
 */
export function PositionIllustration({ cameraView, condition, wrist }: { cameraView: CameraView; condition: Condition; wrist: boolean }) {
  const camera = cameraView === "overhead" ? { x: 150, y: 22, rotate: 90 } : cameraView === "side" ? { x: 222, y: 98, rotate: 180 } : { x: 222, y: 70, rotate: 160 };
  const pivot = wrist ? { x: 132, y: 112 } : { x: 168, y: 112 };
  const cameraWords = cameraView === "overhead" ? "Camera above, looking down" : cameraView === "side" ? "Camera level with the hand, from the side" : "Camera in front of the hand";
  const moveWords = condition === "against_gravity" ? "Move upward, against gravity" : "Slide along the table";
  return (
    <figure className="rounded-card border border-sand-200 bg-sand-50 p-3">
      <svg viewBox="0 0 260 160" role="img" aria-label={`${cameraWords}. ${moveWords}.`} className="mx-auto h-auto w-full max-w-xs">
        {/* table */}
        <rect x="10" y="128" width="240" height="8" rx="2" fill="#e8dcc7" />
        <rect x="24" y="136" width="8" height="20" fill="#e8dcc7" />
        <rect x="228" y="136" width="8" height="20" fill="#e8dcc7" />
        {/* forearm and hand */}
        <rect x="30" y="112" width={wrist ? 100 : 110} height="16" rx="8" fill="#a9d8d3" stroke="#155952" strokeWidth="1.5" />
        <path d={wrist ? "M130 112 q24 -2 44 4 q6 4 0 8 q-20 4 -44 4 z" : "M138 112 h28 q10 2 22 6 q4 4 0 7 q-22 3 -50 3 z"} fill="#d5ecea" stroke="#155952" strokeWidth="1.5" />
        <circle cx={pivot.x} cy={pivot.y + 6} r="3.5" fill="#23857c" />
        {/* movement */}
        {condition === "against_gravity" ? (
          <path d={`M${pivot.x + 40} ${pivot.y} A 40 40 0 0 0 ${pivot.x + 8} ${pivot.y - 36}`} fill="none" stroke="#b4630c" strokeWidth="3" markerEnd="url(#kinarc-arrow)" />
        ) : (
          <>
            <ellipse cx={pivot.x + 18} cy="128" rx="46" ry="7" fill="none" stroke="#b4630c" strokeDasharray="4 3" strokeWidth="1.5" />
            <path d={`M${pivot.x + 44} 130 q -18 10 -44 4`} fill="none" stroke="#b4630c" strokeWidth="3" markerEnd="url(#kinarc-arrow)" />
          </>
        )}
        {/* camera */}
        <g transform={`translate(${camera.x} ${camera.y}) rotate(${camera.rotate})`}>
          <rect x="-14" y="-10" width="28" height="20" rx="4" fill="#1d2a30" />
          <circle cx="14" cy="0" r="6" fill="#45555c" stroke="#1d2a30" strokeWidth="2" />
        </g>
        <defs>
          <marker id="kinarc-arrow" viewBox="0 0 10 10" refX="6" refY="5" markerWidth="5" markerHeight="5" orient="auto-start-reverse">
            <path d="M0 0 L10 5 L0 10 z" fill="#b4630c" />
          </marker>
        </defs>
      </svg>
      <figcaption className="mt-1 text-center text-xs text-ink-soft">
        {cameraWords}. {moveWords}.
      </figcaption>
    </figure>
  );
}
