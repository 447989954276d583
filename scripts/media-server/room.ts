import { type DataPacket, DisconnectReason, Room as RoomInfo } from "@livekit/protocol";
import type { ForwardedTrack } from "./downlink";
import { newSid } from "./ids";
import type { Participant, ParticipantRoom } from "./participant";

/** The participants of one room, by identity, and what passes between them. */
export class Room implements ParticipantRoom {
  readonly sid = newSid("RM");
  private readonly createdAtMs = Date.now();
  private readonly participants = new Map<string, Participant>();

  constructor(
    readonly name: string,
    private readonly onEmpty: (room: Room) => void,
  ) {}

  join(participant: Participant): void {
    // One session per identity, as in LiveKit: a client rejoining after a dropped connection replaces the
    // session the server may not yet know is dead.
    this.participants.get(participant.identity)?.disconnect(DisconnectReason.DUPLICATE_IDENTITY);
    const others = [...this.participants.values()];
    this.participants.set(participant.identity, participant);
    participant.sendJoin(this.info(), others.map((other) => other.info()));
    const joined = participant.info();
    for (const other of others) {
      other.sendUpdate([joined]);
      for (const track of other.liveTracks()) participant.deliver(track);
    }
  }

  remove(participant: Participant): void {
    if (this.participants.get(participant.identity) !== participant) return;
    this.participants.delete(participant.identity);
    const departed = participant.info();
    const trackSids = participant.liveTracks().map(({ trackSid }) => trackSid);
    for (const other of this.participants.values()) {
      for (const trackSid of trackSids) other.withdraw(trackSid);
      other.sendUpdate([departed]);
    }
    if (this.participants.size === 0) this.onEmpty(this);
  }

  announce(participant: Participant): void {
    const info = participant.info();
    for (const other of this.others(participant)) other.sendUpdate([info]);
  }

  trackLive(participant: Participant, track: ForwardedTrack): void {
    // The update goes first so the client knows the publication before its media section arrives.
    this.announce(participant);
    for (const other of this.others(participant)) other.deliver(track);
  }

  trackEnded(participant: Participant, trackSid: string): void {
    for (const other of this.others(participant)) other.withdraw(trackSid);
    this.announce(participant);
  }

  /**
   * Sends a client's data message on to the others, stamped with the sender (clients must not be trusted to
   * name themselves) and limited to `destinationIdentities` when the sender names any.
   */
  relayData(from: Participant, channelLabel: string, packet: DataPacket): void {
    packet.participantIdentity = from.identity;
    packet.participantSid = from.sid;
    const destinations = new Set(packet.destinationIdentities);
    if (packet.value.case === "user") {
      const user = packet.value.value;
      user.participantIdentity = from.identity;
      user.participantSid = from.sid;
      for (const identity of user.destinationIdentities) destinations.add(identity);
    }
    const payload = packet.toBinary();
    for (const other of this.others(from)) {
      if (destinations.size === 0 || destinations.has(other.identity)) other.sendData(channelLabel, payload);
    }
  }

  private others(participant: Participant): Participant[] {
    return [...this.participants.values()].filter((other) => other !== participant);
  }

  private info(): RoomInfo {
    return new RoomInfo({
      sid: this.sid,
      name: this.name,
      creationTime: BigInt(Math.floor(this.createdAtMs / 1000)),
      creationTimeMs: BigInt(this.createdAtMs),
      numParticipants: this.participants.size,
    });
  }
}
