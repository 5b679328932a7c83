// What the desk's read routes answer, written once: the server's services return these types and
// the client's api modules read them. (Envelope answers live beside their schemas in
// shared/schemas/envelope.ts: EnvelopeRecord, SignedEnvelopeSummary, ComparedSession.)
import type { GaugePoint, Member, Photo, Pose, Reading, Team, TestSession, Vehicle } from './schemas';
import type { EnvelopeStatus, HistoryEventRecord } from './schemas/envelope';

/** GET /api/sessions: a session with its vehicle's name and its latest signed-off envelope revision. */
export type SessionSummary = TestSession & { vehicleName: string; signed: { revision: number; signedAt: string } | null };

/** A whole session: what review and the envelope need. */
export interface SessionDetail {
  session: TestSession;
  vehicle: Vehicle;
  gaugePoints: GaugePoint[];
  poses: Pose[];
  readings: (Reading & { enteredBy: string })[];
}

/** GET /api/sessions/:id/review: the session, its photos, who entered its readings (names by user id) and its history. */
export interface SessionReview extends SessionDetail {
  /** The session's photos, each with the pose it belongs to (or none). */
  photos: Photo[];
  people: Record<string, string>;
  history: HistoryEventRecord[];
}

/** GET /api/team: the workshop and its members. */
export interface TeamDetail {
  team: Team;
  members: Member[];
}

/** One revision of a session's envelope, as the vehicle's desk page lists it. */
export interface EnvelopeRevisionSummary {
  id: string;
  revision: number;
  status: EnvelopeStatus;
  signedAt: string | null;
}

/** GET /api/vehicles/:id: a vehicle at the desk, its gauge points and its sessions (newest first) with their envelope revisions (newest first). */
export interface VehicleDesk {
  vehicle: Vehicle;
  gaugePoints: GaugePoint[];
  sessions: (TestSession & { poseCount: number; readingCount: number; envelopes: EnvelopeRevisionSummary[] })[];
}
