import { BadRequest } from "@/lib/http";

export class PayloadTooLarge extends Error {
  constructor(public readonly limitBytes: number) {
    super(`The request body is larger than ${Math.round(limitBytes / (1024 * 1024))} MB. Record a shorter attempt (under a minute) and try again.`);
  }
}

/**
 * Reads a JSON body of at most `limitBytes`, stopping as soon as the limit is passed: a declared length over it is
 * refused before reading, and a body without one is counted as it streams in.
 */
export async function readJsonWithin(request: Request, limitBytes: number): Promise<unknown> {
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > limitBytes) throw new PayloadTooLarge(limitBytes);
  const chunks: Uint8Array[] = [];
  let total = 0;
  if (request.body) {
    const reader = request.body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > limitBytes) {
        await reader.cancel();
        throw new PayloadTooLarge(limitBytes);
      }
      chunks.push(value);
    }
  }
  const text = new TextDecoder().decode(Buffer.concat(chunks));
  try {
    return JSON.parse(text);
  } catch {
    throw new BadRequest("The request body must be JSON.", { _: "expected a JSON object" });
  }
}
