import {
  SessionDescription as ParsedSdp,
  type MediaStreamTrack,
  type RTCDataChannel,
  type RTCPeerConnection,
  type RTCRtpCodecParameters,
  type RTCRtpTransceiver,
  type RTCTrackEvent,
} from "werift";
import { addTrickledCandidate, createPeer } from "./peer";

/** A browser track arriving at the server, with the codec its packets really carry. */
export interface IncomingMedia {
  /** The browser's track id, which the client also sent as `cid` in its AddTrackRequest. */
  cid: string;
  mid: string;
  track: MediaStreamTrack;
  codec: RTCRtpCodecParameters;
  requestKeyframe(): void;
}

// livekit-client's ordered, retransmitted data channel.
const RELIABLE_CHANNEL_LABEL = "_reliable";
// Enough for the moments between a participant appearing to the others and its channels opening.
const MAX_HELD_RELIABLE_MESSAGES = 256;

export interface UplinkEvents {
  candidate(candidateInit: string): void;
  media(incoming: IncomingMedia): void;
  data(channelLabel: string, payload: Buffer): void;
}

/**
 * The client's publisher connection: it offers, the server answers. Carries the client's camera and
 * microphone in, and the data channels both ways (livekit-client reads incoming data on its
 * publisher channels too, so no channel is needed on the subscriber connection).
 */
export class Uplink {
  private readonly pc: RTCPeerConnection;
  private readonly channels = new Map<string, RTCDataChannel>();
  /**
   * Reliable messages for this client that arrived before its reliable channel opened. Others see a
   * participant as soon as it joins, and a prompt sent at that moment must not be lost.
   */
  private readonly heldReliable: Buffer[] = [];
  // werift raises a track again on every renegotiation of the same transceiver.
  private readonly acceptedTransceivers = new Set<string>();
  private sendingCidByMid = new Map<string, string>();

  constructor(private readonly events: UplinkEvents) {
    this.pc = createPeer(events.candidate);
    this.pc.onDataChannel.subscribe((channel) => {
      this.channels.set(channel.label, channel);
      if (channel.label === RELIABLE_CHANNEL_LABEL) {
        if (channel.readyState === "open") this.releaseHeld(channel);
        channel.stateChanged.subscribe((state) => {
          if (state === "open") this.releaseHeld(channel);
        });
      }
      channel.onMessage.subscribe((message) => {
        if (typeof message !== "string") events.data(channel.label, message);
      });
    });
    this.pc.ontrack = (event: RTCTrackEvent) => this.accept(event.track, event.transceiver);
  }

  /**
   * Answers an offer. `preferredMimeType` gives the codec the client asked for per track (AddTrackRequest's
   * first simulcast codec); it goes first in the answer, because the answerer's order decides what the
   * browser sends.
   * @returns the answer and, per media section the client is sending on, the browser track id.
   */
  async answer(
    offerSdp: string,
    preferredMimeType: (cid: string) => string | undefined,
  ): Promise<{ answerSdp: string; sendingCidByMid: ReadonlyMap<string, string> }> {
    // Parsed before applying: werift raises tracks from inside setRemoteDescription.
    this.sendingCidByMid = sendingSections(offerSdp);
    await this.pc.setRemoteDescription({ type: "offer", sdp: offerSdp });
    for (const transceiver of this.pc.getTransceivers()) {
      const cid = transceiver.mid ? this.sendingCidByMid.get(transceiver.mid) : undefined;
      const preferred = cid ? preferredMimeType(cid) : undefined;
      if (preferred) transceiver.codecs = preferFirst(transceiver.codecs, preferred);
    }
    await this.pc.setLocalDescription(await this.pc.createAnswer());
    return { answerSdp: this.pc.localDescription!.sdp, sendingCidByMid: this.sendingCidByMid };
  }

  addCandidate(candidateInit: string): Promise<void> {
    return addTrickledCandidate(this.pc, candidateInit);
  }

  send(channelLabel: string, payload: Uint8Array): void {
    const channel = this.channels.get(channelLabel);
    if (channel?.readyState === "open") {
      channel.send(Buffer.from(payload));
    } else if (channelLabel === RELIABLE_CHANNEL_LABEL && this.heldReliable.length < MAX_HELD_RELIABLE_MESSAGES) {
      this.heldReliable.push(Buffer.from(payload));
    }
  }

  close(): Promise<void> {
    return this.pc.close();
  }

  private releaseHeld(channel: RTCDataChannel): void {
    for (const payload of this.heldReliable.splice(0)) channel.send(payload);
  }

  private accept(track: MediaStreamTrack, transceiver: RTCRtpTransceiver): void {
    if (this.acceptedTransceivers.has(transceiver.id) || !transceiver.mid) return;
    this.acceptedTransceivers.add(transceiver.id);
    const mid = transceiver.mid;
    // The codec is read from the packets themselves: werift's negotiated codec can lag behind what the
    // browser picked, and packets relabelled with the wrong payload type do not decode.
    const { unSubscribe } = track.onReceiveRtp.subscribe((packet) => {
      const codec = transceiver.codecs.find((candidate) => candidate.payloadType === packet.header.payloadType);
      const cid = this.sendingCidByMid.get(mid);
      if (!codec || !cid) return;
      unSubscribe();
      this.events.media({
        cid,
        mid,
        track,
        codec,
        requestKeyframe: () => {
          if (track.ssrc !== undefined) void transceiver.receiver.sendRtcpPLI(track.ssrc);
        },
      });
    });
  }
}

/** Media sections the offerer sends on, by mid, with the browser track id from their `a=msid`. */
function sendingSections(sdp: string): Map<string, string> {
  const cidByMid = new Map<string, string>();
  for (const media of ParsedSdp.parse(sdp).media) {
    const mid = media.rtp.muxId;
    const trackId = media.msid?.split(" ")[1];
    if (mid && trackId && (media.direction === "sendonly" || media.direction === "sendrecv")) {
      cidByMid.set(mid, trackId);
    }
  }
  return cidByMid;
}

function preferFirst(codecs: RTCRtpCodecParameters[], mimeType: string): RTCRtpCodecParameters[] {
  const wanted = (codec: RTCRtpCodecParameters) => codec.mimeType.toLowerCase() === mimeType.toLowerCase();
  return [...codecs.filter(wanted), ...codecs.filter((codec) => !wanted(codec))];
}
