// The demo workshop: an invented shop, invented people and invented trucks, so a newcomer sees a
// realistic flex session at once. Fixed ids make seeding idempotent: a second run changes nothing.
// All names and figures here are made up for the demo.
import { MembershipModel, TeamModel, UserModel, VehicleModel, GaugePointModel, TestSessionModel, PoseModel, ReadingModel } from '../models';
import { hashPassword } from '../auth/lucia';
import type { Axis } from '../../shared/schemas';
import { newGaugePoint, newPose, newReading, newTestSession, newVehicle } from '../../shared/records';
import { EnvelopeModel, PhotoModel } from '../models';
import { savePhoto } from '../services/photos.service';
import { signOff } from '../services/envelope.service';
import { getSessionDetail } from '../services/sessions.service';
import { computeDeskEnvelope, deskFlags } from '../../shared/desk-envelope';
import { DEFAULT_DRAFT_PARAMS, type EnvelopeParams } from '../../shared/schemas/envelope';

export const DEMO_TEAM_ID = '0d3c5a10-0000-4000-8000-000000000001';
export const DEMO_PASSWORD = 'flex-demo-2026';
export const DEMO_PEOPLE = [
  { id: '0d3c5a10-0000-4000-8000-0000000000a1', email: 'ilse@tarnwell.test', name: 'Ilse Darrow', role: 'admin' },
  { id: '0d3c5a10-0000-4000-8000-0000000000a2', email: 'mara@tarnwell.test', name: 'Mara Venn', role: 'engineer' },
  { id: '0d3c5a10-0000-4000-8000-0000000000a3', email: 'joss@tarnwell.test', name: 'Joss Harl', role: 'tester' },
  { id: '0d3c5a10-0000-4000-8000-0000000000a4', email: 'ren@pellstitch.test', name: 'Ren Osk', role: 'viewer' },
] as const;
export const DEMO_SIGN_IN = { email: DEMO_PEOPLE[1].email, password: DEMO_PASSWORD };

export const DEMO_VEHICLES = [
  {
    id: '0d3c5a10-0000-4000-8000-0000000000b1',
    name: 'TC-14 "Mossback"',
    chassis: 'Medium 4×4 cab-chassis, ladder frame',
    body: 'GRP sandwich box on three-point pivoting subframe',
    wheelbaseMm: 3800,
    trackFrontMm: 1900,
    trackRearMm: 1880,
    opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 },
    nominalGapMm: 90,
    // Lateral shear per degree of twist and roll of the cab per degree, for the demo's readings.
    shearPerDeg: 7.4,
    rollPerDeg: 0.0005,
  },
  {
    id: '0d3c5a10-0000-4000-8000-0000000000b2',
    name: 'TC-09 "Longfen"',
    chassis: 'Heavy 4×4 cab-chassis, ladder frame',
    body: 'Aluminium box on four-point spring subframe',
    wheelbaseMm: 4200,
    trackFrontMm: 2050,
    trackRearMm: 2050,
    opening: { widthMm: 600, heightMm: 600, cornerRadiusMm: 100, centreYMm: 0, bottomZMm: 300 },
    nominalGapMm: 110,
    shearPerDeg: 5.5,
    rollPerDeg: 0.0004,
  },
] as const;

const points = [
  { label: 'A', y: 330, z: 830 },
  { label: 'B', y: 0, z: 830 },
  { label: 'C', y: -330, z: 830 },
  { label: 'D', y: -330, z: 370 },
  { label: 'E', y: 0, z: 370 },
  { label: 'F', y: 330, z: 370 },
];

/** Poses of a typical outing: level baseline, single wheels up, diagonals, a 20° ramp. */
const poses = [
  { label: 'Level', kind: 'level', fl: 0, fr: 0, rl: 0, rr: 0 },
  { label: 'FL on 300 block', kind: 'wheels', fl: 300, fr: 0, rl: 0, rr: 0 },
  { label: 'FR on 300 block', kind: 'wheels', fl: 0, fr: 300, rl: 0, rr: 0 },
  { label: 'RL on 300 block', kind: 'wheels', fl: 0, fr: 0, rl: 300, rr: 0 },
  { label: 'Diagonal FL + RR 300', kind: 'wheels', fl: 300, fr: 0, rl: 0, rr: 300 },
  { label: 'Diagonal FR + RL 300', kind: 'wheels', fl: 0, fr: 300, rl: 300, rr: 0 },
  // Front left 1500 mm up a 20° ramp: its lift is 1500 × sin 20° = 513.03 mm (shared/flex/ramp-lift.ts).
  {
    label: 'Ramp 20°, FL up',
    kind: 'ramp',
    fl: 513,
    fr: 0,
    rl: 0,
    rr: 0,
    rampAngle: 20,
    rampDistance: 1500,
    rampWheel: 'fl',
    notes: 'RR tyre just off the ground at the top; gauge bracket at D knocked by the hose, re-seated before reading',
  },
] as const;

const id = (n: number, kind: string) => `0d3c5a10-0000-4000-8${kind}-${n.toString(16).padStart(12, '0')}`;

// A small deterministic generator so the demo's "measurement noise" is the same every run.
function noise(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return (s / 2 ** 32 - 0.5) * 1.2;
  };
}

/** Seeds the demo workshop once, then its signed envelope once; true when anything was added. */
export async function seedDemo(): Promise<boolean> {
  const workshop = await seedWorkshop();
  const envelope = await seedDemoEnvelope();
  const photo = await seedDemoPhoto();
  return workshop || envelope || photo;
}

async function seedWorkshop(): Promise<boolean> {
  if (await TeamModel.findByPk(DEMO_TEAM_ID)) return false;
  const sequelize = TeamModel.sequelize!;
  const hash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    await TeamModel.create({ id: DEMO_TEAM_ID, name: 'Tarnwell Camper Works', unitSystem: 'mm', emailConfirmedAt: new Date() }, { transaction });
    for (const [i, p] of DEMO_PEOPLE.entries()) {
      await UserModel.create({ id: p.id, email: p.email, name: p.name, passwordHash: hash }, { transaction });
      await MembershipModel.create({ id: id(i + 1, '001'), teamId: DEMO_TEAM_ID, userId: p.id, role: p.role }, { transaction });
    }
    const tester = DEMO_PEOPLE[2].id;
    for (const [vi, v] of DEMO_VEHICLES.entries()) {
      const { shearPerDeg, rollPerDeg, ...vehicle } = v;
      await VehicleModel.create({ ...newVehicle({ ...vehicle, opening: { ...vehicle.opening } }), teamId: DEMO_TEAM_ID }, { transaction });
      const pointIds = points.map((_, pi) => id(vi * 100 + pi + 1, '002'));
      for (const [pi, p] of points.entries()) {
        const zScale = v.opening.heightMm / 500;
        const point = newGaugePoint({
          id: pointIds[pi],
          vehicleId: v.id,
          label: p.label,
          yMm: Math.round(p.y * (v.opening.widthMm / 700)),
          zMm: Math.round(v.opening.bottomZMm + (p.z - 350) * zScale),
        });
        await GaugePointModel.create({ ...point, teamId: DEMO_TEAM_ID }, { transaction });
      }
      const sessionId = id(vi + 1, '003');
      await TestSessionModel.create(
        {
          ...newTestSession({
            id: sessionId,
            vehicleId: v.id,
            title: vi === 0 ? 'Yard flex test before boot order' : 'Flex test after subframe rebuild',
            testedOn: vi === 0 ? '2026-11-18' : '2026-11-25',
            conditions: 'Dry gravel yard, 8 °C, overcast',
            loadState: 'Water and fuel full, no crew in body',
            tyrePressures: '3.5 bar front, 4.0 bar rear',
            crew: 'Joss Harl (driver), Ilse Darrow (spotter)',
            readingMode: 'gap',
            safetyAckAt: `${vi === 0 ? '2026-11-18' : '2026-11-25'}T09:05:00.000Z`,
          }),
          teamId: DEMO_TEAM_ID,
          safetyAckBy: tester,
          createdBy: tester,
        },
        { transaction },
      );
      const rand = noise(42 + vi);
      for (const [si, p] of poses.entries()) {
        const poseId = id(vi * 100 + si + 1, '004');
        await PoseModel.create(
          {
            ...newPose({
              id: poseId,
              sessionId,
              seq: si,
              label: p.label,
              kind: p.kind,
              liftFlMm: p.fl,
              liftFrMm: p.fr,
              liftRlMm: p.rl,
              liftRrMm: p.rr,
              rampAngleDeg: 'rampAngle' in p ? p.rampAngle : null,
              rampDistanceMm: 'rampDistance' in p ? p.rampDistance : null,
              rampWheel: 'rampWheel' in p ? p.rampWheel : null,
              notes: 'notes' in p ? p.notes : '',
              recordedAt: new Date(Date.parse(`${vi === 0 ? '2026-11-18' : '2026-11-25'}T09:10:00Z`) + si * 9 * 60_000).toISOString(),
            }),
            teamId: DEMO_TEAM_ID,
            createdBy: tester,
          },
          { transaction },
        );
        // Cross-axle twist imposed at the wheels (degrees), then a small rigid motion of the cab
        // against the body: lateral shear and roll grow with twist, fore-aft and vertical less so.
        const twist = (Math.atan((p.fl - p.fr) / v.trackFrontMm) - Math.atan((p.rl - p.rr) / v.trackRearMm)) * (180 / Math.PI);
        const ty = shearPerDeg * twist;
        const tz = 2.2 * Math.abs(twist);
        const wx = rollPerDeg * twist;
        const tx = 0.6 * Math.abs(twist);
        const wz = 0.0004 * twist;
        const baseline: Record<Axis, number> = { foreAft: v.nominalGapMm, lateral: 20, vertical: 15 };
        for (const [pi, pt] of points.entries()) {
          const gp = { y: pt.y * (v.opening.widthMm / 700), z: v.opening.bottomZMm + (pt.z - 350) * (v.opening.heightMm / 500) };
          const d: Record<Axis, number> = {
            foreAft: tx - wz * gp.y,
            lateral: ty - wx * gp.z,
            vertical: tz + wx * gp.y,
          };
          for (const [ai, axis] of (['foreAft', 'lateral', 'vertical'] as const).entries()) {
            const value = si === 0 ? baseline[axis] : baseline[axis] + d[axis] + rand();
            const reading = newReading({
              id: id(vi * 10000 + si * 100 + pi * 3 + ai + 1, '005'),
              poseId,
              gaugePointId: pointIds[pi],
              axis,
              valueMm: Math.round(value * 2) / 2,
            });
            await ReadingModel.create({ ...reading, teamId: DEMO_TEAM_ID, enteredBy: tester }, { transaction });
          }
        }
      }
    }
  });
  return true;
}

export const DEMO_ENVELOPE_ID = id(1, '006');
/** The reading of the Mossback ramp pose at gauge point D, vertical, that the crew noted. */
const DEMO_FLAGGED_READING_ID = id(6 * 100 + 3 * 3 + 2 + 1, '005');

/**
 * The Mossback session's envelope, signed off by the engineer Mara Venn through the same service
 * the sign-off route uses (computed from the readings in the database), plus a crew's flag note.
 */
async function seedDemoEnvelope(): Promise<boolean> {
  if (await EnvelopeModel.findByPk(DEMO_ENVELOPE_ID)) return false;
  const engineer = DEMO_PEOPLE[1];
  const vehicle = DEMO_VEHICLES[0];
  // The ramp pose's vertical reading at D is 8 mm beyond what the motion explains: the fit flags it
  // on the desk, and the crew noted that they had re-read it.
  const flagged = await ReadingModel.findByPk(DEMO_FLAGGED_READING_ID);
  if (flagged && flagged.flagNote === null) {
    await flagged.update({
      valueMm: flagged.valueMm + 8,
      version: flagged.version + 1,
      flagNote: 'Dial gauge bracket may have flexed on the ramp; re-seated and read again, same value',
    });
  }
  const params: EnvelopeParams = {
    ...DEFAULT_DRAFT_PARAMS,
    designTwistDeg: 20,
    seal: { freeHeightMm: 150, minCompressionPercent: 25, maxCompressionPercent: 50 },
    design: { ...DEFAULT_DRAFT_PARAMS.design, option: 'boot', driverSide: 'left' },
  };
  await EnvelopeModel.create({
    id: DEMO_ENVELOPE_ID,
    teamId: DEMO_TEAM_ID,
    vehicleId: vehicle.id,
    sessionId: id(1, '003'),
    revision: 1,
    params,
    createdBy: engineer.id,
  });
  // The engineer kept the flagged reading after the crew's note, and said so at sign-off.
  const auth = { teamId: DEMO_TEAM_ID, userId: engineer.id, name: engineer.name };
  const detail = await getSessionDetail(auth, id(1, '003'));
  const acknowledgements = deskFlags(detail, computeDeskEnvelope(detail, params).result).map((f) => ({
    readingId: f.readingId,
    note: 'Crew re-seated the dial gauge and read the same value; kept',
  }));
  await signOff(auth, DEMO_ENVELOPE_ID, { version: 1, acknowledgements }, new Date('2026-11-20T15:30:00Z'));
  return true;
}

export const DEMO_PHOTO_ID = id(1, '007');

/**
 * A photo of the Mossback ramp pose, as the tester would have taken it: drawn here (an invented
 * sketch of the gauge at point D across the gap), stored through the upload service.
 */
async function seedDemoPhoto(): Promise<boolean> {
  if (await PhotoModel.findByPk(DEMO_PHOTO_ID)) return false;
  const tester = DEMO_PEOPLE[2];
  const rampPose = id(poses.length, '004');
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="800">
    <rect width="1200" height="800" fill="#9aa39a"/>
    <rect x="80" y="120" width="420" height="600" fill="#d8d2c0" stroke="#333" stroke-width="6"/>
    <rect x="610" y="120" width="510" height="600" fill="#e8e4d8" stroke="#333" stroke-width="6"/>
    <rect x="500" y="380" width="110" height="60" fill="#f2a13a" stroke="#333" stroke-width="4"/>
    <text x="520" y="480" font-size="40" font-family="sans-serif" fill="#111">D</text>
    <text x="90" y="780" font-size="34" font-family="sans-serif" fill="#111">cab · gauge D · body (invented demo photo)</text>
  </svg>`;
  // Loaded here, not at the top: the server's cold start does not wait for sharp.
  const { default: sharp } = await import('sharp');
  const jpeg = await sharp(Buffer.from(svg)).jpeg({ quality: 80 }).toBuffer();
  await savePhoto(
    { teamId: DEMO_TEAM_ID, userId: tester.id },
    { id: DEMO_PHOTO_ID, sessionId: id(1, '003'), poseId: rampPose, caption: 'Gauge D across the gap, ramp pose' },
    jpeg,
  );
  return true;
}
