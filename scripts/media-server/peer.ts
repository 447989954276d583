import { RTCPeerConnection, useH264, useOPUS, useVP8, type RTCIceCandidate } from "werift";

/**
 * A werift peer connection set up for browsers on the same machine or LAN.
 * `iceServers: []` because werift's default points at a public STUN server this network cannot reach;
 * loopback is added as a host address so a browser on 127.0.0.1 finds a pair at once.
 * Codec objects are made fresh per connection: werift writes negotiated payload types into them.
 */
export function createPeer(onCandidate: (candidateInit: string) => void): RTCPeerConnection {
  const pc = new RTCPeerConnection({
    codecs: { audio: [useOPUS()], video: [useVP8(), useH264()] },
    iceServers: [],
    iceAdditionalHostAddresses: ["127.0.0.1"],
    iceUseIpv6: false,
  });
  pc.onIceCandidate.subscribe((candidate?: RTCIceCandidate) => {
    if (candidate) onCandidate(JSON.stringify(candidate.toJSON()));
  });
  return pc;
}

/** Applies a trickled candidate; the client sends `RTCIceCandidateInit` as a JSON string. */
export async function addTrickledCandidate(pc: RTCPeerConnection, candidateInit: string): Promise<void> {
  const candidate = JSON.parse(candidateInit) as { candidate?: string };
  // An empty candidate marks the end of the client's gathering; werift needs nothing for it.
  if (!candidate.candidate) return;
  await pc.addIceCandidate(candidate);
}
