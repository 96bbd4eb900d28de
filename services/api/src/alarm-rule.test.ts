import { describe, expect, it } from 'vitest';
import { alarmAction, CLEAR_AFTER, RAISE_AFTER } from './alarm-rule.js';

// Levels of ISO 10816-3 group 2 rigid without point levels (ALARM = B/C 2.8, TRIP = C/D 4.5 mm/s) and the
// velocity clear level 0.9 × 2.8 = 2.52 mm/s; a fault score's 0.5 / 0.4.
const velocity = { alarmLevel: 2.8, tripLevel: 4.5, clearLevel: 2.52 };
const score = { alarmLevel: 0.5, tripLevel: null, clearLevel: 0.4 };

describe('alarmAction (persistence and hysteresis, ANSI/ISA-18.2 on-delay and deadband)', () => {
  it('raises ALARM only after two recordings in a row at or over the level', () => {
    expect(RAISE_AFTER).toBe(2);
    expect(alarmAction(velocity, [1.0, 3.0], null)).toEqual({ action: 'none' });
    expect(alarmAction(velocity, [3.0, 2.9], null)).toEqual({ action: 'raise', level: 'alarm', value: 2.9, threshold: 2.8 });
    expect(alarmAction(score, [0.55], null)).toEqual({ action: 'none' });
  });

  it('raises TRIP at once, and escalates an open ALARM to TRIP', () => {
    expect(alarmAction(velocity, [1.0, 5.0], null)).toEqual({ action: 'raise', level: 'trip', value: 5.0, threshold: 4.5 });
    expect(alarmAction(velocity, [5.0], null)).toMatchObject({ action: 'raise', level: 'trip' });
    expect(alarmAction(velocity, [3.0, 4.6], { level: 'alarm' })).toEqual({ action: 'escalate', value: 4.6, threshold: 4.5 });
    expect(alarmAction(velocity, [4.6, 4.7], { level: 'trip' })).toEqual({ action: 'none' });
  });

  it('clears only after two recordings in a row under the clear level, not under the alarm level', () => {
    expect(CLEAR_AFTER).toBe(2);
    // 2.6 is under ALARM (2.8) but over the clear level (2.52): the alarm stays
    expect(alarmAction(velocity, [2.6, 2.6], { level: 'alarm' })).toEqual({ action: 'none' });
    expect(alarmAction(velocity, [3.0, 1.0], { level: 'alarm' })).toEqual({ action: 'none' });
    expect(alarmAction(velocity, [2.0, 1.0], { level: 'alarm' })).toMatchObject({ action: 'clear' });
    expect(alarmAction(velocity, [2.0, 1.0], { level: 'trip' })).toMatchObject({ action: 'clear' });
    expect(alarmAction(score, [0.45, 0.42], { level: 'alarm' })).toEqual({ action: 'none' });
    expect(alarmAction(score, [0.39, 0.2], { level: 'alarm' })).toMatchObject({ action: 'clear' });
  });

  it('stops a score hovering about 0.5 from raising and clearing every few recordings', () => {
    // 0.52, 0.47, 0.53, 0.46, ...: the old rule (raise at >= 0.5, clear under it) raised and cleared at every other value
    const values = [0.3, 0.52, 0.47, 0.53, 0.46, 0.55, 0.48, 0.51, 0.44, 0.56];
    let open: { level: 'alarm' | 'trip' } | null = null;
    let raises = 0;
    let clears = 0;
    for (let i = 0; i < values.length; i++) {
      const a = alarmAction(score, values.slice(Math.max(0, i - 1), i + 1), open);
      if (a.action === 'raise') { raises++; open = { level: a.level }; }
      if (a.action === 'clear') { clears++; open = null; }
    }
    expect(raises).toBe(0);
    expect(clears).toBe(0);
  });

  it('does nothing for an indicator without levels', () => {
    expect(alarmAction({ alarmLevel: null, tripLevel: null, clearLevel: null }, [100, 100], null)).toEqual({ action: 'none' });
  });
});
