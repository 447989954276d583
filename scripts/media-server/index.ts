import { env } from "@/lib/env";
import { startMediaServer } from "./server";

// `npm run media-server`: the development stand-in for a LiveKit server. Key and secret come from the
// validated environment (LIVEKIT_API_KEY / LIVEKIT_API_SECRET, with development defaults locally).
const DEFAULT_PORT = 7880;

function readPort(raw: string | undefined): number {
  if (raw === undefined) return DEFAULT_PORT;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 1 || port > 65535) {
    throw new Error(`MEDIA_SERVER_PORT: expected a whole number from 1 to 65535, got "${raw}"`);
  }
  return port;
}

async function main(): Promise<void> {
  const settings = env();
  if (settings.KINARC_DEPLOYMENT === "production") {
    throw new Error(
      "KINARC_DEPLOYMENT=production: the development media server does not run in production; point LIVEKIT_URL at a LiveKit server",
    );
  }
  const server = await startMediaServer({
    port: readPort(process.env.MEDIA_SERVER_PORT),
    apiKey: settings.LIVEKIT_API_KEY,
    apiSecret: settings.LIVEKIT_API_SECRET,
  });
  console.log(
    [
      "==================================================================",
      " Kinarc DEVELOPMENT media server: a stand-in for a LiveKit server.",
      " For development and tests only. NOT FOR PRODUCTION: no congestion",
      " control, no TURN, one quality per track, no session resume.",
      ` Listening on ${server.url} (API key "${settings.LIVEKIT_API_KEY}")`,
      "==================================================================",
    ].join("\n"),
  );
  const stop = () => {
    void server.close().then(() => process.exit(0));
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
