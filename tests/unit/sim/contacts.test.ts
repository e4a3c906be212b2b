/**
 * Contacts of the TRUE footprint with an obstacle: reported with the obstacle id, the robot stops
 * where it was (the bumper), and each contact episode counts once.
 *
 * The drive: charging-bay-pass starts at (5.5, 3.0) facing north; straight ahead the battery cage
 * (x 3–8, y 11.5–12.5) closes the aisle, so a straight drive north runs into it at y ≈ 11.05
 * (half the pallet mover's 0.9 m length short of the cage).
 */
import { describe, expect, it } from 'vitest';
import { DriveSim, type BatchResult } from '../../../shared/sim';
import { driveSetup, repeat } from './fixtures';

/** Drives north one command per batch until the first contact; returns the sim and the contact batch. */
function driveIntoCage(seed: string) {
  const sim = new DriveSim(driveSetup('charging-bay-pass', seed));
  let hit: BatchResult | undefined;
  for (let k = 0; k < 200 && !hit; k++) {
    const r = sim.applyBatch([{ v: 1, w: 0 }]);
    if (r.events.some((e) => e.type === 'contact')) hit = r;
  }
  if (!hit) throw new Error('no contact within 20 s');
  return { sim, hit };
}

describe('contacts', () => {
  it('driving into the battery cage reports a contact with its id and stops the robot where it was', () => {
    const { sim, hit } = driveIntoCage('contact-1');
    expect(hit.events).toContainEqual({ type: 'contact', seq: hit.seq, obstacleId: 'battery-cage' });
    expect(hit.state.contacts).toBe(1);
    expect(hit.state.v).toBe(0);
    expect(hit.state.w).toBe(0);
    expect(hit.state.status).toBe('driving');
    // The contact step left odometry and truth where the previous step had them.
    const [before, at] = sim.trace.slice(-2);
    expect(at.contact).toBe('battery-cage');
    expect(at.odometry).toEqual(before.odometry);
    expect(at.truth).toEqual(before.truth);
    expect(hit.odometry[0]).toEqual(before.odometry);
    // Stopped just short of the cage (front at y < 11.5 but within one step of 0.1 m and the drift).
    const front = sim.truePose().y + 0.45;
    expect(front).toBeLessThan(11.5);
    expect(front).toBeGreaterThan(11.5 - 0.1 - 0.1);
    // The truth at the stop does not touch the cage.
    expect(sim.world.contactAt(sim.truePose())).toBeNull();
  });

  it('after the contact, holding still leaves odometry and truth where they are and counts nothing more', () => {
    const { sim } = driveIntoCage('contact-2');
    const odometry = sim.state().odometry;
    const truth = sim.truePose();
    const r = sim.applyBatch(repeat(20, { v: 0, w: 0 }));
    expect(r.odometry.every((p) => p.x === odometry.x && p.y === odometry.y && p.theta === odometry.theta)).toBe(true);
    expect(sim.truePose()).toEqual(truth);
    expect(r.state.contacts).toBe(1);
    expect(r.events.filter((e) => e.type === 'contact')).toEqual([]);
  });

  it('contacts count episodes: pushing on with the bumper engaged is no new contact and no motion', () => {
    const { sim } = driveIntoCage('contact-6');
    expect(sim.state().blocked).toBe(true);
    const r = sim.applyBatch(repeat(30, { v: 1, w: 0 }));
    expect(r.events.filter((e) => e.type === 'contact')).toEqual([]);
    expect(r.state.contacts).toBe(1);
    expect(r.state.blocked).toBe(true);
    expect(sim.trace.filter((s) => s.contact)).toHaveLength(1);
    // A stop releases the bumper.
    expect(sim.applyBatch([{ v: 0, w: 0 }]).state.blocked).toBe(false);
  });

  it('backing away and driving in again is a second contact episode', () => {
    const { sim } = driveIntoCage('contact-3');
    sim.applyBatch(repeat(15, { v: -0.3, w: 0 }));
    sim.applyBatch(repeat(5, { v: 0, w: 0 }));
    expect(sim.state().odometry.y).toBeLessThan(10.9);
    let r: BatchResult | undefined;
    for (let k = 0; k < 100 && !r; k++) {
      const b = sim.applyBatch([{ v: 0.6, w: 0 }]);
      if (b.events.some((e) => e.type === 'contact')) r = b;
    }
    expect(r?.events).toContainEqual({ type: 'contact', seq: r!.seq, obstacleId: 'battery-cage' });
    expect(r!.state.contacts).toBe(2);
  });

  it('reversing into the west wall reports the wall by its id', () => {
    // long-aisle-run starts at (4, 7.6) facing east; the west wall (x ≤ 0.3) is behind it.
    // (The map edge, id "map-edge", is covered in world.test.ts: the shipped walls hide it.)
    const sim = new DriveSim(driveSetup('long-aisle-run', 'contact-4'));
    let hit: BatchResult | undefined;
    for (let k = 0; k < 300 && !hit; k++) {
      const r = sim.applyBatch([{ v: -0.3, w: 0 }]);
      if (r.events.some((e) => e.type === 'contact')) hit = r;
    }
    expect(hit?.events.find((e) => e.type === 'contact')).toMatchObject({ obstacleId: 'wall-west' });
  });

  // After a contact the bumper stays engaged until the operator stops or reverses (drive.ts advance()).
  it('pushing on against the cage is one contact episode and does not move the odometry', () => {
    const { sim } = driveIntoCage('contact-5');
    const odometry = sim.state().odometry;
    const r = sim.applyBatch(repeat(20, { v: 1, w: 0 }));
    expect(r.state.contacts).toBe(1);
    expect(r.state.odometry).toEqual(odometry);
  });
});
