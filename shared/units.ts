import type { Quantity } from './schemas/enums.ts';

// Historian units and their conversion into Osmia's canonical units: bar, m³/h, µS/cm, °C.
// Factors: 1 psi = 0.0689475729 bar (NIST SP 811, psi = 6894.757 Pa); 1 US gpm = 0.2271247 m³/h
// (3.785411784 L × 60); 1 L/s = 3.6 m³/h; 1 mS/cm = 1000 µS/cm; °F → °C = (F − 32) × 5/9.

export type Dimension = 'pressure' | 'flow' | 'conductivity' | 'temperature' | 'status';

export const quantityDimension: Record<Quantity, Dimension> = {
  run_status: 'status',
  feed_pressure: 'pressure',
  concentrate_pressure: 'pressure',
  permeate_pressure: 'pressure',
  feed_flow: 'flow',
  permeate_flow: 'flow',
  concentrate_flow: 'flow',
  feed_conductivity: 'conductivity',
  permeate_conductivity: 'conductivity',
  feed_temperature: 'temperature',
};

export const canonicalUnit: Record<Dimension, string> = {
  pressure: 'bar',
  flow: 'm3/h',
  conductivity: 'uS/cm',
  temperature: 'degC',
  status: '',
};

interface Linear {
  dimension: Dimension;
  factor: number;
  offset: number;
}

const units: Record<string, Linear> = {
  bar: { dimension: 'pressure', factor: 1, offset: 0 },
  mbar: { dimension: 'pressure', factor: 0.001, offset: 0 },
  psi: { dimension: 'pressure', factor: 0.0689475729, offset: 0 },
  kpa: { dimension: 'pressure', factor: 0.01, offset: 0 },
  mpa: { dimension: 'pressure', factor: 10, offset: 0 },
  'm3/h': { dimension: 'flow', factor: 1, offset: 0 },
  'm³/h': { dimension: 'flow', factor: 1, offset: 0 },
  'm3/d': { dimension: 'flow', factor: 1 / 24, offset: 0 },
  gpm: { dimension: 'flow', factor: 0.227124707, offset: 0 },
  'l/s': { dimension: 'flow', factor: 3.6, offset: 0 },
  'l/min': { dimension: 'flow', factor: 0.06, offset: 0 },
  'us/cm': { dimension: 'conductivity', factor: 1, offset: 0 },
  'µs/cm': { dimension: 'conductivity', factor: 1, offset: 0 },
  'μs/cm': { dimension: 'conductivity', factor: 1, offset: 0 },
  'ms/cm': { dimension: 'conductivity', factor: 1000, offset: 0 },
  degc: { dimension: 'temperature', factor: 1, offset: 0 },
  '°c': { dimension: 'temperature', factor: 1, offset: 0 },
  c: { dimension: 'temperature', factor: 1, offset: 0 },
  degf: { dimension: 'temperature', factor: 5 / 9, offset: (-32 * 5) / 9 },
  '°f': { dimension: 'temperature', factor: 5 / 9, offset: (-32 * 5) / 9 },
  f: { dimension: 'temperature', factor: 5 / 9, offset: (-32 * 5) / 9 },
  k: { dimension: 'temperature', factor: 1, offset: -273.15 },
  '': { dimension: 'status', factor: 1, offset: 0 },
};

export const knownUnits = Object.keys(units).filter((u) => u !== '');

export type UnitCheck = { ok: true; convert: (value: number) => number; canonical: string } | { ok: false; reason: string };

/** The converter from `unit` into the canonical unit of `quantity`, or why the pair is not valid. */
export function unitFor(quantity: Quantity, unit: string): UnitCheck {
  const key = unit.trim().toLowerCase().replace(/\s+/g, '');
  const dimension = quantityDimension[quantity];
  const u = units[key];
  if (!u) return { ok: false, reason: `unknown unit "${unit}" (known: ${knownUnits.join(', ')})` };
  if (u.dimension !== dimension) {
    return {
      ok: false,
      reason: dimension === 'status' ? `run_status takes no unit, got "${unit}"` : `unit "${unit}" is not a ${dimension} unit for ${quantity}`,
    };
  }
  const { factor, offset } = u;
  const convert = factor === 1 && offset === 0 ? (v: number) => v : (v: number) => v * factor + offset;
  return { ok: true, convert, canonical: canonicalUnit[dimension] };
}
