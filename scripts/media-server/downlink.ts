import {
  MediaStream,
  MediaStreamTrack,
  RTCRtpCodecParameters,
  type RTCPeerConnection,
  type RTCRtpTransceiver,
} from "werift";
import type { IncomingMedia } from "./uplink";
import { addTrickledCandidate, createPeer } from "./peer";

/** A published track as another participant receives it. */
export interface ForwardedTrack {
  trackSid: string;
  participantSid: string;
  media: IncomingMedia;
}

interface Forwarding {
  transceiver: RTCRtpTransceiver;
  requestKeyframe(): void;
  stop(): void;
}

export interface DownlinkEvents {
  candidate(candidateInit: string): void;
  offer(sdp: string, offerId: number, midToTrackId: Record<string, string>): void;
}

/**
 * The client's subscriber connection: the server offers the other participants' tracks, the client answers.
 * One offer is in flight at a time; changes made meanwhile go out in the next one.
 */
export class Downlink {
  private readonly pc: RTCPeerConnection;
  private readonly forwardings = new Map<string, Forwarding>();
  private offerId = 0;
  private awaitingAnswer = false;
  private changedSinceOffer = false;
  private closed = false;

  constructor(private readonly events: DownlinkEvents) {
    this.pc = createPeer(events.candidate);
    this.pc.connectionStateChange.subscribe((state) => {
      // A keyframe sent before the browser could receive it is lost; ask again once the path is up.
      if (state === "connected") this.requestKeyframes();
    });
  }

  add({ trackSid, participantSid, media }: ForwardedTrack): void {
    if (this.closed || this.forwardings.has(trackSid)) return;
    const transceiver = this.pc.addTransceiver(media.track.kind, { direction: "sendonly" });
    // Packets pass through as they are, so the section offers exactly the codec the publisher sends, with
    // its payload type. A copy: werift writes negotiated values into the codec objects of a connection.
    transceiver.codecs = [new RTCRtpCodecParameters({ ...media.codec })];
    // livekit-client finds the participant and track from the stream id "PA_…|TR_…".
    transceiver.sender.setStreams([new MediaStream({ id: `${participantSid}|${trackSid}` })]);
    const outgoing = new MediaStreamTrack({ kind: media.track.kind });
    void transceiver.sender.replaceTrack(outgoing);
    // werift rewrites ssrc, payload type and sequence numbers in place when it sends: each
    // subscriber gets its own copy of every packet.
    const relay = media.track.onReceiveRtp.subscribe((packet) => outgoing.writeRtp(packet.clone()));
    const keyframes = transceiver.sender.onPictureLossIndication.subscribe(() => media.requestKeyframe());
    this.forwardings.set(trackSid, {
      transceiver,
      requestKeyframe: media.requestKeyframe,
      stop: () => {
        relay.unSubscribe();
        keyframes.unSubscribe();
        outgoing.stop();
      },
    });
    this.scheduleOffer();
  }

  /**
   * Stops sending a track. Its media section stays `sendonly` without a track rather than going
   * inactive (werift refuses idle receive-only sections); the client drops the track when the
   * participant update no longer lists it.
   */
  remove(trackSid: string): void {
    const forwarding = this.forwardings.get(trackSid);
    if (!forwarding) return;
    forwarding.stop();
    void forwarding.transceiver.sender.replaceTrack(null);
    this.forwardings.delete(trackSid);
  }

  async acceptAnswer(sdp: string): Promise<void> {
    await this.pc.setRemoteDescription({ type: "answer", sdp });
    this.awaitingAnswer = false;
    this.requestKeyframes();
    if (this.changedSinceOffer) this.scheduleOffer();
  }

  addCandidate(candidateInit: string): Promise<void> {
    return addTrickledCandidate(this.pc, candidateInit);
  }

  close(): Promise<void> {
    this.closed = true;
    for (const forwarding of this.forwardings.values()) forwarding.stop();
    this.forwardings.clear();
    return this.pc.close();
  }

  private scheduleOffer(): void {
    if (this.awaitingAnswer) {
      this.changedSinceOffer = true;
      return;
    }
    this.awaitingAnswer = true;
    this.changedSinceOffer = false;
    this.sendOffer().catch((error: unknown) => console.error("media-server: subscriber offer failed", error));
  }

  private async sendOffer(): Promise<void> {
    await this.pc.setLocalDescription(await this.pc.createOffer());
    if (this.closed) return;
    const midToTrackId: Record<string, string> = {};
    for (const [trackSid, { transceiver }] of this.forwardings) {
      if (transceiver.mid) midToTrackId[transceiver.mid] = trackSid;
    }
    this.events.offer(this.pc.localDescription!.sdp, ++this.offerId, midToTrackId);
  }

  private requestKeyframes(): void {
    for (const forwarding of this.forwardings.values()) forwarding.requestKeyframe();
  }
}
