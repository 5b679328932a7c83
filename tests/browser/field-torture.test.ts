// A tester as a real one types: online with the sync timer running, human-fast keystrokes (30 to
// 150 ms apart, seeded), lifts, 6 gauge points × 3 axes of readings, pose names and notes
// interleaved over many poses, with the connection dropping and coming back and the page reloaded
// at random points (mid-value too). At every check the screen shows what was typed, and whenever
// the bar says "All saved on the server", PostgreSQL holds exactly what was typed; at the end it
// does, with no conflict kept. TORTURE_SEED=<n> replays another seed; a failure prints its seed
// and the last actions.
import { describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { readingDoubt, liftDoubt } from '@/features/poses/plausible';
import { createTeam, type TestServer } from '../support/test-app';
import { vehicleRecord } from '../support/sync';
import { browserHarness } from '../support/browser';
import { barText, fieldSession, openConflicts, openPhone, type FieldSession } from '../support/field-phone';

const SEED = Number(process.env.TORTURE_SEED ?? 20261211);
const ROUNDS = 20;

const h = browserHarness();

/** mulberry32: a small seeded generator, so every run types the same keys at the same pace. */
function generator(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    chance: (p: number) => next() < p,
    int: (lo: number, hi: number) => lo + Math.floor(next() * (hi - lo + 1)),
    pick: <T>(list: readonly T[]) => list[Math.floor(next() * list.length)],
  };
}

const AXES = [
  ['foreAft', 'fore-aft'],
  ['lateral', 'lateral'],
  ['vertical', 'vertical'],
] as const;
const WHEELS = [
  ['liftFlMm', 'front left'],
  ['liftFrMm', 'front right'],
  ['liftRlMm', 'rear left'],
  ['liftRrMm', 'rear right'],
] as const;
type LiftKey = (typeof WHEELS)[number][0];

/** What the tester typed into one pose, as the screen should show it and the server should hold it. */
interface TypedPose {
  label: string;
  notes: string;
  lifts: Record<LiftKey, number>;
  /** `${gaugePointId}|${axis}` → millimetres. */
  readings: Map<string, number>;
}

/** The test truck (the sizes vehicleWithPoints pushes): what the recorder's plausibility check compares with. */
const TRUCK = vehicleRecord();

/** How the app reads a length typed in mm: a comma or point decimal; anything else keeps the last good value. */
const parseMm = (text: string): number | null | 'bad' => {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  return /^[-+]?(\d+\.?\d*|\.\d+)$/.test(t) ? Number(t) : 'bad';
};

describe('field recorder under a fast tester, flaky signal and reloads', () => {
  it(`keeps every keystroke and tells the truth (seed ${SEED}, ${ROUNDS} rounds)`, async () => {
    const rnd = generator(SEED);
    const team = await createTeam('Torture workshop');
    const f = await fieldSession(h.ts, team);
    const { context, page } = await openPhone(h, team.members.tester.email);
    const typed = new Map<string, TypedPose>();
    typed.set(f.levelPoseId, { label: 'Pose 1', notes: '', lifts: { liftFlMm: 0, liftFrMm: 0, liftRlMm: 0, liftRrMm: 0 }, readings: new Map() });
    const log: string[] = [];
    const say = (line: string) => log.push(line);
    let offline = false;
    let current = f.levelPoseId;
    let checks = 0;
    let allSavedChecks = 0;
    const human = () => page.waitForTimeout(rnd.int(30, 150));
    const started = Date.now();

    try {
      await page.goto(f.poseUrl(current));
      await page.getByLabel('Pose name').waitFor();

      /** Now and then, between two keystrokes: the signal drops or returns, or the page reloads. */
      const disturb = async (p: number): Promise<'reloaded' | null> => {
        if (rnd.chance(p)) {
          offline = !offline;
          say(offline ? 'offline' : 'online');
          await context.setOffline(offline);
        }
        if (rnd.chance(p * 0.7)) {
          say('reload');
          await page.reload();
          await page.getByLabel('Pose name').waitFor();
          return 'reloaded';
        }
        return null;
      };

      /** Selects the field's text and types `text` key by key, as a thumb would; returns after each key's echo. */
      const typeInto = async (label: string, text: string, onKey: (soFar: string, cut?: 'reloaded') => void, exact = false) => {
        const input = page.getByLabel(label, { exact });
        await input.click();
        await page.keyboard.press('ControlOrMeta+a');
        if (text === '') {
          await page.keyboard.press('Backspace');
          onKey('');
          return;
        }
        for (let i = 0; i < text.length; i++) {
          await human();
          await page.keyboard.type(text[i]);
          onKey(text.slice(0, i + 1));
          // The bar is read at once after a key, when a claim of "all saved" is most likely false.
          if (rnd.chance(0.1)) await barTellsTruth();
          // A reload or a dropped signal can come between any two keys; after a reload the
          // tester starts on another value.
          if (i < text.length - 1 && (await disturb(0.02)) === 'reloaded') {
            onKey(text.slice(0, i + 1), 'reloaded');
            return;
          }
        }
      };

      /**
       * Types a length. A value the recorder finds implausible is kept back (the phone keeps the
       * value from before the edit) until the tester confirms it: the model follows that key by
       * key, and at the end the tester confirms the value, as one does after re-reading the tape.
       */
      const typeLength = async (label: string, text: string, was: number | null, doubt: (mm: number) => string | null, set: (mm: number | null) => void) => {
        say(`type ${label} "${text}"`);
        let last: number | null = was;
        let cut = false;
        await typeInto(label, text, (soFar, final) => {
          const v = parseMm(soFar);
          last = v === 'bad' || (v !== null && doubt(v)) ? was : v;
          set(last);
          if (final === 'reloaded') cut = true;
        });
        const v = parseMm(text);
        if (cut || v === 'bad' || v === null || !doubt(v)) return;
        say(`keep ${text}`);
        const keep = page.getByRole('button', { name: /^Keep .* mm$/ });
        await keep.click();
        await keep.waitFor({ state: 'detached' });
        set(v);
      };

      const randomLength = () => {
        const whole = rnd.int(-60, 420);
        return rnd.chance(0.3) ? `${whole}.${rnd.int(1, 9)}` : String(whole);
      };

      const words = ['front', 'left', 'rear', 'block', 'ramp', 'cold', 'spotter', 'dry', 'gravel', '300', 'high', 'twist'];
      const phrase = (n: number) => Array.from({ length: n }, () => rnd.pick(words)).join(' ');

      const typeField = async () => {
        const pose = typed.get(current)!;
        const kind = rnd.next();
        if (kind < 0.15) {
          const [key, name] = rnd.pick(WHEELS);
          await page.getByRole('button', { name: new RegExp(`wheel ${name}$`) }).click();
          const track = key.startsWith('liftF') ? TRUCK.trackFrontMm : TRUCK.trackRearMm;
          await typeLength(
            `Lift ${name}`,
            String(rnd.int(-80, 450)),
            pose.lifts[key],
            (mm) => liftDoubt(mm, track, 'mm'),
            (mm) => (pose.lifts[key] = mm ?? 0),
          );
        } else if (kind < 0.8) {
          const point = rnd.int(0, f.labels.length - 1);
          const [axis, axisName] = rnd.pick(AXES);
          const slot = `${f.pointIds[point]}|${axis}`;
          const text = rnd.chance(0.08) ? '' : randomLength();
          await typeLength(
            `${f.labels[point]} ${axisName}`,
            text,
            pose.readings.get(slot) ?? null,
            (mm) => readingDoubt(mm, axis, 'gap', TRUCK, 'mm'),
            (mm) => (mm === null ? pose.readings.delete(slot) : pose.readings.set(slot, mm)),
          );
        } else if (kind < 0.9) {
          const text = `${rnd.pick(['Front left', 'Rear right', 'Cross-axle', 'Ramp'])} ${rnd.int(1, 99)}`;
          say(`type pose name "${text}"`);
          await typeInto('Pose name', text, (soFar) => (pose.label = soFar));
        } else {
          // Notes grow: the tester adds a few words at the end.
          const add = `${pose.notes ? ' ' : ''}${phrase(rnd.int(1, 3))}`;
          say(`add to notes "${add}"`);
          const notes = page.getByLabel('Notes', { exact: true });
          await notes.click();
          await page.keyboard.press('ControlOrMeta+End');
          const before = pose.notes;
          for (let i = 0; i < add.length; i++) {
            await human();
            await page.keyboard.type(add[i]);
            pose.notes = before + add.slice(0, i + 1);
          }
        }
      };

      /** The screen shows what was typed (given a moment for the last keystroke to be stored and shown). */
      const screenShowsTyped = async () => {
        const pose = typed.get(current)!;
        await page.locator('body').click({ position: { x: 5, y: 5 } });
        const expected: Record<string, string> = { 'Pose name': pose.label.trim() };
        for (const [key, name] of WHEELS) expected[`Lift ${name}`] = String(pose.lifts[key]);
        f.labels.forEach((label, i) => {
          for (const [axis, axisName] of AXES) {
            const v = pose.readings.get(`${f.pointIds[i]}|${axis}`);
            expected[`${label} ${axisName}`] = v === undefined ? '' : String(v);
          }
        });
        // Every labelled input at once: label text (without the unit) → value, numbers normalised.
        const shown = () =>
          page.evaluate((labels) => {
            const out: Record<string, string> = {};
            for (const el of document.querySelectorAll('label')) {
              const input = el.htmlFor ? (document.getElementById(el.htmlFor) as HTMLInputElement | null) : el.querySelector('input');
              const name = (el.textContent ?? '').replace(/\s*\((mm|in)\)\s*$/, '').trim();
              if (!input || !labels.includes(name)) continue;
              const value = input.value.trim();
              out[name] = name === 'Pose name' ? value : value === '' ? '' : String(Number(value));
            }
            return out;
          }, Object.keys(expected));
        await expect.poll(shown, { timeout: 5_000 }).toEqual(expected);
        expect((await page.getByLabel('Notes', { exact: true }).inputValue()).trim()).toBe(pose.notes.trim());
      };

      /** Whenever the bar claims everything is on the server, PostgreSQL holds exactly what was typed. */
      const barTellsTruth = async (waitForSync = false) => {
        if (waitForSync && !offline) await page.getByTestId('sync-pending').getByText('All saved on the server').waitFor({ timeout: 30_000 });
        checks += 1;
        const bar = await barText(page);
        expect(await page.getByText(/conflicts? to resolve/).count(), 'a conflict on one phone').toBe(0);
        if (bar.includes('All saved on the server')) {
          allSavedChecks += 1;
          expect(await serverHolds(h.ts, f), `the bar said "${bar}"`).toEqual(expectedOnServer(typed));
        }
      };

      for (let round = 0; round < ROUNDS; round++) {
        say(`— round ${round}`);
        if (rnd.chance(0.3) || round === 1) {
          await page.getByRole('link', { name: /all poses/ }).click();
          await page.getByRole('button', { name: /Record the (next|level) pose/ }).click();
          await page.waitForURL(/\/poses\/[0-9a-f-]{36}$/);
          current = page.url().split('/').pop()!;
          await page.getByLabel('Pose name').waitFor();
          const label = await page.getByLabel('Pose name').inputValue();
          typed.set(current, { label, notes: '', lifts: { liftFlMm: 0, liftFrMm: 0, liftRlMm: 0, liftRrMm: 0 }, readings: new Map() });
          say(`new pose ${current.slice(0, 8)} "${label}"`);
          // eslint-disable-next-line no-dupe-else-if -- each rnd.chance() is a new draw, not the same condition
        } else if (typed.size > 1 && rnd.chance(0.3)) {
          const other = rnd.pick([...typed.keys()].filter((id) => id !== current));
          say(`open pose ${other.slice(0, 8)}`);
          await page.goto(f.poseUrl(other));
          current = other;
          await page.getByLabel('Pose name').waitFor();
        }
        const fields = rnd.int(3, 5);
        for (let k = 0; k < fields; k++) {
          await typeField();
          // A pause long enough for the sync after saving to start; typing goes on while it runs.
          if (rnd.chance(0.15)) await page.waitForTimeout(rnd.int(1_600, 2_400));
          else await human();
          await disturb(0.08);
        }
        await screenShowsTyped();
        // Every fourth round the tester waits for the bar to say all is sent, and it must be so.
        await barTellsTruth(round % 4 === 3);
      }

      say('online, final sync');
      if (offline) await context.setOffline(false);
      await page.getByTestId('sync-pending').getByText('All saved on the server').waitFor({ timeout: 60_000 });
      await barTellsTruth();
      expect(await serverHolds(h.ts, f)).toEqual(expectedOnServer(typed));
      expect(await openConflicts(h.ts, team.teamId)).toBe(0);
      await page.reload();
      await page.getByLabel('Pose name').waitFor();
      await screenShowsTyped();
      console.log(
        `field torture (seed ${SEED}): ${((Date.now() - started) / 1000).toFixed(0)} s, ${ROUNDS} rounds, ${typed.size} poses, ${checks} bar checks (${allSavedChecks} said all saved)`,
      );
    } catch (err) {
      console.log(`field torture failed with seed ${SEED}; last actions:\n${log.slice(-40).join('\n')}`);
      throw err;
    } finally {
      await context.close();
    }
  }, 300_000);
});

type ServerPose = { label: string; notes: string; lifts: Record<LiftKey, number>; readings: Record<string, number> };

/** What PostgreSQL holds for the session: live poses and readings. */
async function serverHolds(ts: TestServer, f: FieldSession): Promise<Record<string, ServerPose>> {
  const poses = await h.ts.sequelize.query<{
    id: string;
    label: string;
    notes: string;
    lift_fl_mm: number;
    lift_fr_mm: number;
    lift_rl_mm: number;
    lift_rr_mm: number;
  }>('SELECT id, label, notes, lift_fl_mm, lift_fr_mm, lift_rl_mm, lift_rr_mm FROM poses WHERE session_id = $1 AND deleted_at IS NULL', {
    bind: [f.sessionId],
    type: QueryTypes.SELECT,
  });
  const readings = await h.ts.sequelize.query<{ pose_id: string; gauge_point_id: string; axis: string; value_mm: number }>(
    'SELECT r.pose_id, r.gauge_point_id, r.axis, r.value_mm FROM readings r JOIN poses p ON p.id = r.pose_id WHERE p.session_id = $1 AND r.deleted_at IS NULL',
    { bind: [f.sessionId], type: QueryTypes.SELECT },
  );
  const out: Record<string, ServerPose> = {};
  for (const p of poses) {
    out[p.id] = {
      label: p.label,
      notes: p.notes,
      lifts: { liftFlMm: p.lift_fl_mm, liftFrMm: p.lift_fr_mm, liftRlMm: p.lift_rl_mm, liftRrMm: p.lift_rr_mm },
      readings: {},
    };
  }
  for (const r of readings)
    (out[r.pose_id] ??= { label: '?', notes: '?', lifts: {} as ServerPose['lifts'], readings: {} }).readings[`${r.gauge_point_id}|${r.axis}`] = r.value_mm;
  return out;
}

function expectedOnServer(typed: Map<string, TypedPose>): Record<string, ServerPose> {
  const out: Record<string, ServerPose> = {};
  for (const [id, p] of typed) {
    const readings: Record<string, number> = {};
    for (const [slot, v] of p.readings) readings[slot] = v;
    out[id] = { label: p.label.trim(), notes: p.notes.trim(), lifts: { ...p.lifts }, readings };
  }
  return out;
}
