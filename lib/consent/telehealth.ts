import { createHash } from "node:crypto";

/**
 * The telehealth consent a client reads and signs before their first video visit. Written for Kinarc; a clinic's
 * own legal wording may replace it, and every change gets a new version so each signature points at the text shown.
 */
export const TELEHEALTH_CONSENT = {
  version: "2026-12-v1",
  title: "Consent to video visits with Kinarc",
  paragraphs: [
    "Your therapist will see and hear you over a video link, and Kinarc will measure the movement of your wrist and fingers from your camera picture while you move.",
    "The measuring happens in your own browser. Kinarc sends your therapist the measured joint positions and angles during the visit, and stores the attempts your therapist keeps, in your clinic's record. The video itself is not recorded.",
    "A video visit cannot test strength against resistance or feel a muscle working. Your therapist may ask you to come in for those parts, and Kinarc will say which ones are still needed.",
    "Move only within comfort. Stop and tell your therapist at once if pain, swelling, numbness or a change of colour comes on or gets worse. Your surgeon's instructions come first.",
    "Choose a private, well-lit place. You can stop the visit at any time, and you can withdraw this consent by telling your clinic; your care continues in person.",
    "If the connection drops, the attempts recorded on your device are kept and sent when you are back online.",
  ],
} as const;

export function consentTextSha256(consent: { title: string; paragraphs: readonly string[] } = TELEHEALTH_CONSENT): string {
  return createHash("sha256").update([consent.title, ...consent.paragraphs].join("\n\n")).digest("hex");
}
