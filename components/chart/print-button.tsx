"use client";

export function PrintButton() {
  return (
    <button type="button" onClick={() => window.print()} className="rounded-lg px-4 py-2 font-semibold text-tide-700 ring-1 ring-tide-200">
      Print
    </button>
  );
}
