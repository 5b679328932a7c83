// Live reads of the field store for the screens (dexie-react-hooks): each re-renders when the
// tables it reads change. Records are checked with the shared schemas on the way out; deleted
// ones are left out; corrupt rows are counted, not shown as data.
import { useLiveQuery } from 'dexie-react-hooks';
import type { GaugePoint, Pose, Reading, RetestRequest, TestSession, Vehicle } from '@shared/schemas';
import { fieldDb } from './field-db';
import { checkRows } from './records';
import { getMeta, type MetaValues } from './meta';
import { localWrites, useLocalWrites } from './writes-in-flight';

const live = <T extends { deletedAt?: string | null }>(rows: T[]) => rows.filter((r) => !r.deletedAt);

export function useLocalVehicles() {
  return useLiveQuery(async () => {
    const checked = checkRows<Vehicle>('vehicle', await fieldDb.vehicles.toArray());
    return { vehicles: live(checked.records).sort((a, b) => a.name.localeCompare(b.name)), corrupt: checked.corrupt };
  });
}

export function useLocalVehicle(id: string | undefined) {
  return useLiveQuery(async () => {
    if (!id) return null;
    const [v] = checkRows<Vehicle>('vehicle', [await fieldDb.vehicles.get(id)].filter(Boolean)).records;
    if (!v) return null;
    const points = checkRows<GaugePoint>('gaugePoint', await fieldDb.gaugePoints.where('vehicleId').equals(id).toArray());
    return { vehicle: v, gaugePoints: live(points.records).sort((a, b) => a.label.localeCompare(b.label, 'en', { numeric: true })), allPoints: points.records };
  }, [id]);
}

/**
 * The sessions on this phone, newest first, each with how many poses it has and how many of its
 * records (the session, its poses and readings) and photos still wait to be sent.
 */
export function useLocalSessions() {
  return useLiveQuery(async () => {
    const checked = checkRows<TestSession>('testSession', await fieldDb.sessions.toArray());
    const vehicles = new Map((await fieldDb.vehicles.toArray()).map((v) => [v.id, v.name]));
    const allPoses = await fieldDb.poses.toArray();
    const poses = live(allPoses);
    const sessionOfPose = new Map(allPoses.map((p) => [p.id, p.sessionId]));
    const waiting = new Set((await fieldDb.outbox.toArray()).map((e) => `${e.entity}:${e.recordId}`));
    const waitingReadings = await fieldDb.readings.bulkGet([...waiting].filter((k) => k.startsWith('reading:')).map((k) => k.slice('reading:'.length)));
    const unsent = new Map<string, number>();
    const count = (sessionId: string | undefined) => sessionId && unsent.set(sessionId, (unsent.get(sessionId) ?? 0) + 1);
    for (const key of waiting) {
      const [entity, id] = key.split(':');
      if (entity === 'testSession') count(id);
      else if (entity === 'pose') count(sessionOfPose.get(id));
    }
    for (const r of waitingReadings) if (r) count(sessionOfPose.get(r.poseId));
    for (const p of await fieldDb.photos.where('status').equals('pending').toArray()) count(p.sessionId);
    const openRetests = new Map<string, number>();
    for (const r of live(checkRows<RetestRequest>('retestRequest', await fieldDb.retestRequests.toArray()).records)) {
      if (r.state === 'open') openRetests.set(r.sessionId, (openRetests.get(r.sessionId) ?? 0) + 1);
    }
    return {
      sessions: live(checked.records)
        .sort((a, b) => b.testedOn.localeCompare(a.testedOn))
        .map((s) => ({
          ...s,
          vehicleName: vehicles.get(s.vehicleId) ?? '(vehicle not on this phone)',
          poseCount: poses.filter((p) => p.sessionId === s.id).length,
          unsent: unsent.get(s.id) ?? 0,
          openRetests: openRetests.get(s.id) ?? 0,
        })),
      corrupt: checked.corrupt,
    };
  });
}

export interface LocalSession {
  session: TestSession;
  vehicle: Vehicle | null;
  gaugePoints: GaugePoint[];
  poses: Pose[];
  readings: Reading[];
  corrupt: { id: string; message: string }[];
}

/** A session with everything the recorder needs: vehicle, gauge points, poses and all readings. */
export function useLocalSession(id: string | undefined) {
  return useLiveQuery(async (): Promise<LocalSession | null> => {
    if (!id) return null;
    const [s] = checkRows<TestSession>('testSession', [await fieldDb.sessions.get(id)].filter(Boolean)).records;
    if (!s) return null;
    const [v] = checkRows<Vehicle>('vehicle', [await fieldDb.vehicles.get(s.vehicleId)].filter(Boolean)).records;
    const points = checkRows<GaugePoint>('gaugePoint', await fieldDb.gaugePoints.where('vehicleId').equals(s.vehicleId).toArray());
    const poses = checkRows<Pose>('pose', await fieldDb.poses.where('sessionId').equals(id).toArray());
    const poseIds = poses.records.map((p) => p.id);
    const readings = checkRows<Reading>('reading', await fieldDb.readings.where('poseId').anyOf(poseIds).toArray());
    return {
      session: s,
      vehicle: v ?? null,
      gaugePoints: live(points.records).sort((a, b) => a.label.localeCompare(b.label, 'en', { numeric: true })),
      poses: live(poses.records).sort((a, b) => a.seq - b.seq),
      readings: readings.records,
      corrupt: [...points.corrupt, ...poses.corrupt, ...readings.corrupt],
    };
  }, [id]);
}

/** A session's re-test requests, open ones first, then newest first; withdrawn ones left out. */
export function useLocalRetests(sessionId: string | undefined) {
  return useLiveQuery(async () => {
    if (!sessionId) return { requests: [], corrupt: [] };
    const checked = checkRows<RetestRequest>('retestRequest', await fieldDb.retestRequests.where('sessionId').equals(sessionId).toArray());
    const order = { open: 0, answered: 1, closed: 2 } as const;
    const requests = live(checked.records).sort((a, b) => order[a.state] - order[b.state] || b.askedAt.localeCompare(a.askedAt));
    return { requests, corrupt: checked.corrupt };
  }, [sessionId]);
}

export function useSessionPhotos(sessionId: string | undefined) {
  return useLiveQuery(async () => (sessionId ? fieldDb.photos.where('sessionId').equals(sessionId).toArray() : []), [sessionId]);
}

export interface PendingCounts {
  /** Records with a change the server does not have yet: waiting, in flight or held back. */
  records: number;
  held: number;
  photos: number;
  failedPhotos: number;
  conflicts: number;
  /** When the batch that is backing off goes again. */
  retryAt: string | null;
  /** How many local writes had settled when these were read: all of them are counted here. */
  settledAtRead: number;
}

/** What waits to reach the server; read again after every local write settles. */
export function usePendingCounts(): PendingCounts | undefined {
  const { settled } = useLocalWrites();
  return useLiveQuery(async (): Promise<PendingCounts> => {
    const settledAtRead = localWrites().settled;
    const entries = await fieldDb.outbox.toArray();
    const batch = await fieldDb.batches.toCollection().first();
    return {
      records: new Set(entries.map((e) => `${e.entity}:${e.recordId}`)).size,
      held: new Set(entries.filter((e) => e.held).map((e) => `${e.entity}:${e.recordId}`)).size,
      photos: await fieldDb.photos.where('status').equals('pending').count(),
      failedPhotos: await fieldDb.photos.where('status').equals('failed').count(),
      conflicts: (await fieldDb.conflicts.toArray()).filter((c) => !c.resolvedAt).length,
      retryAt: batch?.retryAt ?? null,
      settledAtRead,
    };
  }, [settled]);
}

export function useRefusedPhotos() {
  return useLiveQuery(() => fieldDb.photos.where('status').equals('failed').toArray());
}

export function useOpenConflicts() {
  return useLiveQuery(async () => (await fieldDb.conflicts.toArray()).filter((c) => !c.resolvedAt));
}

export function useMetaValue<K extends keyof MetaValues>(key: K) {
  return useLiveQuery(() => getMeta(key), [key]);
}
