// The benchmark's server and data: the real app in this process on the bench cluster, one
// workshop with a tester, and helpers to build what the field client would push.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomUUID } from 'node:crypto';
import { pino } from 'pino';
import { createSequelize } from '../../db';
import { initModels, MembershipModel, TeamModel, UserModel } from '../../models';
import { migrate } from '../../migrate';
import { createApp } from '../../app';
import { hashPassword, startSession } from '../../auth/lucia';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../../shared/records';

export async function startBenchServer(databaseUrl: string) {
  const sequelize = createSequelize(databaseUrl, 10);
  initModels(sequelize);
  await migrate(sequelize);
  const app = createApp({ logger: pino({ level: 'silent' }), clientDir: process.env.CLIENT_DIR });
  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const { teamId, userId, headers } = await newWorkshop(baseUrl);
  return {
    sequelize,
    baseUrl,
    teamId,
    userId,
    headers,
    newWorkshop: () => newWorkshop(baseUrl),
    async post(path: string, body: unknown, asHeaders = headers) {
      const res = await fetch(baseUrl + path, { method: 'POST', headers: asHeaders, body: JSON.stringify(body) });
      if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
      return res.json();
    },
    async close() {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await sequelize.close();
    },
  };
}

/** A workshop with one engineer signed in; its request headers carry the session and Origin. */
async function newWorkshop(baseUrl: string) {
  const teamId = randomUUID();
  const userId = randomUUID();
  await TeamModel.create({ id: teamId, name: 'Bench workshop' });
  await UserModel.create({ id: userId, email: `bench-${userId.slice(0, 8)}@bench.test`, name: 'Bench engineer', passwordHash: await hashPassword(randomUUID()) });
  await MembershipModel.create({ id: randomUUID(), teamId, userId, role: 'engineer' });
  const cookie = (await startSession(userId, teamId)).split(';')[0];
  return { teamId, userId, headers: { 'Content-Type': 'application/json', Origin: baseUrl, Cookie: cookie } };
}

export type BenchServer = Awaited<ReturnType<typeof startBenchServer>>;

/** A vehicle with 12 gauge points and a session with enough poses for `readings` readings. */
export function sessionChanges(readings: number) {
  const vehicleId = randomUUID();
  const sessionId = randomUUID();
  const points = Array.from({ length: 12 }, (_, i) => newGaugePoint({ vehicleId, label: `P${i + 1}`, yMm: -330 + (i % 4) * 220, zMm: 370 + Math.floor(i / 4) * 230 }));
  const poseCount = Math.ceil(readings / 36);
  const poses = Array.from({ length: poseCount }, (_, seq) =>
    newPose({ sessionId, seq, label: `Pose ${seq}`, kind: seq === 0 ? 'level' : 'wheels', liftFlMm: seq === 0 ? 0 : 50 + (seq % 400) }),
  );
  const readingRows = poses
    .flatMap((p, pi) => points.flatMap((g) => (['foreAft', 'lateral', 'vertical'] as const).map((axis) => newReading({ poseId: p.id, gaugePointId: g.id, axis, valueMm: Math.round((10 + pi * 0.1) * 10) / 10 }))))
    .slice(0, readings);
  const parents = [
    { entity: 'vehicle', record: newVehicle({ id: vehicleId, name: 'Bench truck', trackRearMm: 1880 }) },
    ...points.map((record) => ({ entity: 'gaugePoint', record })),
    { entity: 'testSession', record: newTestSession({ id: sessionId, vehicleId, title: 'Bench', testedOn: '2026-12-01', safetyAckAt: new Date().toISOString() }) },
    ...poses.map((record) => ({ entity: 'pose', record })),
  ];
  return { sessionId, parents, readings: readingRows };
}
