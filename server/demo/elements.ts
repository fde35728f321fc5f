import { type DemoPlant, type StageIndex, type TrainCode, vesselCode } from './plant.ts';
import { Rng } from './random.ts';
import { DAY, HOUR, MINUTE, onDayShift, roundToMinute } from './times.ts';

export type LifeEndingReason = 'failed' | 'performance' | 'damaged';
export type CensoringReason = 'planned' | 'relocated' | 'sampled';
export type RemovalReason = LifeEndingReason | CensoringReason;

export interface ElementInstall {
  serial: string;
  model: string;
  price: number;
  train: TrainCode;
  stage: StageIndex;
  vessel: string;
  position: number;
  installedAt: number;
  removedAt: number | null;
  removalReason: RemovalReason | null;
}

export function isLifeEnding(reason: RemovalReason | null): boolean {
  return reason === 'failed' || reason === 'performance' || reason === 'damaged';
}

/**
 * Every element position of the plant from commissioning to `endMs`. Each element draws a life from
 * its stage's planted Weibull and an independent exponential censoring time; the element leaves at
 * the earlier of the two (moved to the next day shift), and its replacement goes in at that instant.
 * An element whose removal would fall within the last day is still in service at the end.
 */
export function simulateElements(plant: DemoPlant, seed: string, endMs: number): ElementInstall[] {
  const rng = new Rng(seed, 'elements');
  const { elements } = plant;
  const { timeZone } = plant.site;
  const switchAt = Date.parse(elements.modelSwitchAt);
  const [oldModel, newModel] = elements.models;
  const lastRemoval = endMs - elements.inServiceTailHours * HOUR;
  const installs: Omit<ElementInstall, 'serial'>[] = [];

  const chooseModel = (at: number) =>
    at < switchAt || rng.chance(elements.oldStockShare) ? oldModel : newModel;

  for (const train of plant.trains) {
    const commissioned = Date.parse(train.commissionedAt);
    if (commissioned >= endMs) throw new Error(`${train.code} is commissioned after the end of the data`);
    // Commissioning loads one vessel after another over the first days, on the day shift.
    let loadAt = onDayShift(commissioned, timeZone, elements.dayShift.fromHour, elements.dayShift.toHour);
    for (const stage of plant.stages) {
      for (let v = 1; v <= stage.vessels; v++) {
        const vessel = vesselCode(train.code, stage.index, v);
        for (let position = 1; position <= stage.elementsPerVessel; position++) {
          let installedAt = loadAt + position * 4 * MINUTE;
          for (;;) {
            const model = chooseModel(installedAt);
            const price = Math.round(rng.inRange(model.price));
            const lifeDays = rng.weibull(stage.elementLife.shape, stage.elementLife.scaleDays);
            const censorDays = rng.exponential(elements.censorMeanDays);
            const nominal = installedAt + Math.min(lifeDays, censorDays) * DAY;
            let removedAt = onDayShift(nominal, timeZone, elements.dayShift.fromHour, elements.dayShift.toHour);
            const shiftMinutes = rng.between(0, 90);
            if (removedAt !== nominal) removedAt += shiftMinutes * MINUTE;
            removedAt = Math.max(roundToMinute(removedAt), installedAt + MINUTE);
            const base = { model: model.name, price, train: train.code, stage: stage.index, vessel, position, installedAt };
            if (removedAt > lastRemoval) {
              installs.push({ ...base, removedAt: null, removalReason: null });
              break;
            }
            const removalReason: RemovalReason =
              lifeDays <= censorDays ? rng.weighted(elements.lifeEndingReasons) : rng.weighted(elements.censorReasons);
            installs.push({ ...base, removedAt, removalReason });
            installedAt = removedAt;
          }
        }
        loadAt = onDayShift(loadAt + 2.5 * HOUR, timeZone, elements.dayShift.fromHour, elements.dayShift.toHour);
      }
    }
  }

  // Serial numbers follow the order the elements went in, with the model's prefix and the install year.
  const order = installs
    .map((install, index) => ({ install, index }))
    .sort((a, b) => a.install.installedAt - b.install.installedAt || a.index - b.index);
  const serials = new Array<string>(installs.length);
  const prefixOf = new Map(elements.models.map((m) => [m.name, m.serialPrefix]));
  order.forEach(({ install, index }, seq) => {
    const year = String(new Date(install.installedAt).getUTCFullYear() % 100).padStart(2, '0');
    serials[index] = `${prefixOf.get(install.model)}${year}-${String(seq + 1).padStart(5, '0')}`;
  });
  return installs.map((install, index) => ({ ...install, serial: serials[index] }));
}
