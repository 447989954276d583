import {
  type AddTrackRequest,
  DataPacket,
  DisconnectReason,
  JoinResponse,
  LeaveRequest,
  LeaveRequest_Action,
  ParticipantInfo,
  ParticipantInfo_State,
  ParticipantPermission,
  ParticipantUpdate,
  Pong,
  SessionDescription,
  SignalRequest,
  SignalResponse,
  SignalTarget,
  TrackInfo,
  TrackPublishedResponse,
  TrackType,
  TrackUnpublishedResponse,
  TrickleRequest,
  type Room as RoomInfo,
} from "@livekit/protocol";
import type { WebSocket } from "ws";
import type { RoomAccess } from "./access";
import { Downlink, type ForwardedTrack } from "./downlink";
import { newSid } from "./ids";
import { SERVER_INFO } from "./server-info";
import { type IncomingMedia, Uplink } from "./uplink";

/** The room as a participant sees it; implemented by `Room`. */
export interface ParticipantRoom {
  remove(participant: Participant): void;
  announce(participant: Participant): void;
  trackLive(participant: Participant, track: ForwardedTrack): void;
  trackEnded(participant: Participant, trackSid: string): void;
  relayData(from: Participant, channelLabel: string, packet: DataPacket): void;
}

// Sent in the JoinResponse; livekit-client pings every PING_INTERVAL_S and gives up after PING_TIMEOUT_S.
export const PING_INTERVAL_S = 5;
export const PING_TIMEOUT_S = 15;
// Well inside the reissued tokens' ten-minute lifetime.
const TOKEN_REFRESH_INTERVAL_MS = 5 * 60 * 1000;

type SignalMessage = SignalResponse["message"];

interface RequestedTrack {
  info: TrackInfo;
  /** The codec the client named first (AddTrackRequest.simulcastCodecs[0]), as a MIME type. */
  preferredMimeType?: string;
}

/**
 * One client's session: its signalling socket, its publisher (uplink) and subscriber (downlink) connections,
 * and the tracks it publishes.
 */
export class Participant {
  readonly sid = newSid("PA");
  private readonly joinedAtMs = Date.now();
  private version = 1;
  private state = ParticipantInfo_State.ACTIVE;
  /** Tracks the client asked to publish, by browser track id (cid). */
  private readonly requestedTracks = new Map<string, RequestedTrack>();
  /** Tracks whose media has arrived, by track sid. */
  private readonly liveMedia = new Map<string, IncomingMedia>();
  private readonly uplink: Uplink;
  private readonly downlink: Downlink;
  private pending: Promise<void> = Promise.resolve();
  private lastPingAtMs = Date.now();
  private readonly pingWatch: NodeJS.Timeout;
  private readonly tokenRefresh: NodeJS.Timeout;
  private ended = false;

  constructor(
    private readonly socket: WebSocket,
    readonly access: RoomAccess,
    private readonly room: ParticipantRoom,
    private readonly reissueToken: () => Promise<string>,
  ) {
    this.uplink = new Uplink({
      candidate: (candidateInit) => this.trickle(candidateInit, SignalTarget.PUBLISHER),
      media: (incoming) => this.mediaArrived(incoming),
      data: (channelLabel, payload) => this.dataArrived(channelLabel, payload),
    });
    this.downlink = new Downlink({
      candidate: (candidateInit) => this.trickle(candidateInit, SignalTarget.SUBSCRIBER),
      offer: (sdp, id, midToTrackId) =>
        this.signal({ case: "offer", value: new SessionDescription({ type: "offer", sdp, id, midToTrackId }) }),
    });
    socket.on("message", (data, isBinary) => {
      let request: SignalRequest;
      try {
        if (!isBinary) throw new Error("text frame");
        request = SignalRequest.fromBinary(new Uint8Array(data as Buffer));
      } catch {
        console.warn(`media-server: ${this.identity} sent a frame that is not a binary SignalRequest; ignored`);
        return;
      }
      // Requests are handled one after another: an answer must not overtake the offer it answers.
      this.pending = this.pending
        .then(() => this.handle(request))
        .catch((error: unknown) => console.error(`media-server: ${this.identity}: ${request.message.case} failed`, error));
    });
    socket.on("close", () => this.end());
    // A dropped network can leave the socket open for minutes; the client's missing pings tell sooner.
    this.pingWatch = setInterval(() => {
      if (Date.now() - this.lastPingAtMs > PING_TIMEOUT_S * 1000) socket.terminate();
    }, PING_INTERVAL_S * 1000);
    this.tokenRefresh = setInterval(() => this.refreshToken(), TOKEN_REFRESH_INTERVAL_MS);
  }

  get identity(): string {
    return this.access.identity;
  }

  info(): ParticipantInfo {
    const tracks = [...this.liveMedia.keys()].flatMap((trackSid) => this.trackInfo(trackSid) ?? []);
    return new ParticipantInfo({
      sid: this.sid,
      identity: this.access.identity,
      name: this.access.name,
      metadata: this.access.metadata,
      attributes: this.access.attributes,
      state: this.state,
      tracks,
      joinedAt: BigInt(Math.floor(this.joinedAtMs / 1000)),
      joinedAtMs: BigInt(this.joinedAtMs),
      // livekit-client ignores an update whose version is older than the one it holds.
      version: this.version,
      isPublisher: tracks.length > 0,
      permission: new ParticipantPermission({
        canPublish: this.access.canPublish,
        canSubscribe: this.access.canSubscribe,
        canPublishData: this.access.canPublishData,
      }),
    });
  }

  liveTracks(): ForwardedTrack[] {
    return [...this.liveMedia].map(([trackSid, media]) => ({ trackSid, participantSid: this.sid, media }));
  }

  sendJoin(room: RoomInfo, others: ParticipantInfo[]): void {
    this.signal({
      case: "join",
      value: new JoinResponse({
        room,
        participant: this.info(),
        otherParticipants: others,
        serverVersion: SERVER_INFO.version,
        serverInfo: SERVER_INFO,
        iceServers: [],
        // Two-connection mode: the client publishes on its own offer, the server offers what it receives.
        subscriberPrimary: false,
        pingTimeout: PING_TIMEOUT_S,
        pingInterval: PING_INTERVAL_S,
      }),
    });
    // At once too: the token the client came with may be about to expire.
    this.refreshToken();
  }

  sendUpdate(participants: ParticipantInfo[]): void {
    this.signal({ case: "update", value: new ParticipantUpdate({ participants }) });
  }

  deliver(track: ForwardedTrack): void {
    if (this.access.canSubscribe) this.downlink.add(track);
  }

  withdraw(trackSid: string): void {
    this.downlink.remove(trackSid);
  }

  sendData(channelLabel: string, payload: Uint8Array): void {
    this.uplink.send(channelLabel, payload);
  }

  /** Tells the client to go away for good, then ends the session. */
  disconnect(reason: DisconnectReason): void {
    this.signal({
      case: "leave",
      value: new LeaveRequest({ canReconnect: false, reason, action: LeaveRequest_Action.DISCONNECT }),
    });
    this.end();
  }

  /** Ends the session once, whichever way it ends: leave request, closed socket, missed pings, replaced. */
  private end(): void {
    if (this.ended) return;
    this.ended = true;
    clearInterval(this.pingWatch);
    clearInterval(this.tokenRefresh);
    this.state = ParticipantInfo_State.DISCONNECTED;
    this.version += 1;
    this.room.remove(this);
    void this.uplink.close();
    void this.downlink.close();
    if (this.socket.readyState === this.socket.OPEN) this.socket.close(1000, "left the room");
  }

  private async handle(request: SignalRequest): Promise<void> {
    if (this.ended) return;
    const message = request.message;
    switch (message.case) {
      case "offer": {
        const { answerSdp, sendingCidByMid } = await this.uplink.answer(message.value.sdp, (cid) =>
          this.requestedTracks.get(cid)?.preferredMimeType,
        );
        this.signal({ case: "answer", value: new SessionDescription({ type: "answer", sdp: answerSdp, id: message.value.id }) });
        this.endStoppedTracks(sendingCidByMid);
        return;
      }
      case "answer":
        return this.downlink.acceptAnswer(message.value.sdp);
      case "trickle":
        return message.value.target === SignalTarget.PUBLISHER
          ? this.uplink.addCandidate(message.value.candidateInit)
          : this.downlink.addCandidate(message.value.candidateInit);
      case "addTrack":
        return this.requestTrack(message.value);
      case "mute":
        return this.setMuted(message.value.sid, message.value.muted);
      case "leave":
        return this.end();
      case "ping":
        this.lastPingAtMs = Date.now();
        return this.signal({ case: "pong", value: BigInt(Date.now()) });
      case "pingReq":
        this.lastPingAtMs = Date.now();
        return this.signal({
          case: "pongResp",
          value: new Pong({ lastPingTimestamp: message.value.timestamp, timestamp: BigInt(Date.now()) }),
        });
      default:
        // Subscription choices, layers and quality settings: the stand-in forwards every track at the one
        // quality it is sent, to everyone.
        return;
    }
  }

  private requestTrack(request: AddTrackRequest): void {
    if (!this.access.canPublish) {
      console.warn(`media-server: ${this.identity} may not publish (token grant canPublish: false); track ignored`);
      return;
    }
    const track = new TrackInfo({
      sid: newSid("TR"),
      type: request.type,
      source: request.source,
      name: request.name,
      muted: request.muted,
      width: request.width,
      height: request.height,
      stream: request.stream,
      stereo: request.stereo,
      disableDtx: request.disableDtx,
    });
    const codec = request.simulcastCodecs[0]?.codec;
    const kind = request.type === TrackType.VIDEO ? "video" : "audio";
    this.requestedTracks.set(request.cid, { info: track, preferredMimeType: codec ? `${kind}/${codec}` : undefined });
    this.signal({ case: "trackPublished", value: new TrackPublishedResponse({ cid: request.cid, track }) });
  }

  private mediaArrived(media: IncomingMedia): void {
    const track = this.requestedTracks.get(media.cid)?.info;
    if (!track || this.ended) return;
    track.mid = media.mid;
    track.mimeType = media.codec.mimeType;
    this.liveMedia.set(track.sid, media);
    this.version += 1;
    this.room.trackLive(this, { trackSid: track.sid, participantSid: this.sid, media });
  }

  /** Tracks whose media section the latest offer no longer sends on have been unpublished. */
  private endStoppedTracks(sendingCidByMid: ReadonlyMap<string, string>): void {
    for (const [trackSid, media] of this.liveMedia) {
      if (sendingCidByMid.get(media.mid) === media.cid) continue;
      this.liveMedia.delete(trackSid);
      this.requestedTracks.delete(media.cid);
      this.version += 1;
      this.signal({ case: "trackUnpublished", value: new TrackUnpublishedResponse({ trackSid }) });
      this.room.trackEnded(this, trackSid);
    }
  }

  private setMuted(trackSid: string, muted: boolean): void {
    const track = this.trackInfo(trackSid);
    if (!track) return;
    track.muted = muted;
    this.version += 1;
    this.room.announce(this);
  }

  private dataArrived(channelLabel: string, payload: Buffer): void {
    if (!this.access.canPublishData) return;
    let packet: DataPacket;
    try {
      packet = DataPacket.fromBinary(new Uint8Array(payload));
    } catch {
      console.warn(`media-server: ${this.identity} sent a data message that is not a DataPacket; dropped`);
      return;
    }
    this.room.relayData(this, channelLabel, packet);
  }

  private trackInfo(trackSid: string): TrackInfo | undefined {
    return [...this.requestedTracks.values()].find(({ info }) => info.sid === trackSid)?.info;
  }

  private refreshToken(): void {
    this.reissueToken().then(
      (token) => this.signal({ case: "refreshToken", value: token }),
      (error: unknown) => console.error(`media-server: ${this.identity}: token refresh failed`, error),
    );
  }

  private trickle(candidateInit: string, target: SignalTarget): void {
    this.signal({ case: "trickle", value: new TrickleRequest({ candidateInit, target }) });
  }

  private signal(message: SignalMessage): void {
    if (this.socket.readyState !== this.socket.OPEN) return;
    this.socket.send(new SignalResponse({ message }).toBinary());
  }
}
