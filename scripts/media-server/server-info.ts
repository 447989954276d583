import { ServerInfo, ServerInfo_Edition } from "@livekit/protocol";

/**
 * What the stand-in tells clients about itself. livekit-client turns features on by the server version it
 * reads (RPC needs 1.8.0 or later), so it claims the LiveKit server release whose signalling it follows;
 * `nodeId` and `debugInfo` say what it really is.
 */
export const SERVER_INFO = new ServerInfo({
  edition: ServerInfo_Edition.Standard,
  version: "1.9.0",
  protocol: 16,
  nodeId: "kinarc-dev-media",
  debugInfo: "Kinarc development stand-in for a LiveKit server; not for production",
});
