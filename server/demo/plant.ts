// The invented demo plant: its structure and every parameter the generator plants in the data.
// Nothing here is a real place, utility, maker or product. generate.ts reads this file and copies
// the planted values into manifest.json so tests can check that the KPI engine recovers them.

export type Quantity =
  | 'run_status'
  | 'feed_pressure'
  | 'concentrate_pressure'
  | 'permeate_pressure'
  | 'feed_flow'
  | 'permeate_flow'
  | 'concentrate_flow'
  | 'feed_conductivity'
  | 'permeate_conductivity'
  | 'feed_temperature';

/** Unit spellings of docs/design.md §5; '' is the unit of run_status. */
export type Unit = 'bar' | 'psi' | 'kPa' | 'm3/h' | 'gpm' | 'L/s' | 'uS/cm' | 'mS/cm' | 'degC' | 'degF' | '';

export type AssetKind = 'train' | 'stage' | 'vessel' | 'pump' | 'filter' | 'instrument' | 'other';
export type StageIndex = 1 | 2;
export type TrainCode = 'T1' | 'T2';
export type QualityStyle = 'words' | 'opc';

/** The stage quantities measured on every stage (run_status lives on trains and pumps). */
export const stageQuantities = [
  'feed_pressure',
  'concentrate_pressure',
  'permeate_pressure',
  'feed_flow',
  'permeate_flow',
  'concentrate_flow',
  'feed_conductivity',
  'permeate_conductivity',
  'feed_temperature',
] as const satisfies readonly Quantity[];
export type StageQuantity = (typeof stageQuantities)[number];

/** Tag-name suffix of each stage quantity (tags read e.g. `T1.S2.PERM_COND`). */
export const stageTagSuffix: Record<StageQuantity, string> = {
  feed_pressure: 'FEED_PRESS',
  concentrate_pressure: 'CONC_PRESS',
  permeate_pressure: 'PERM_PRESS',
  feed_flow: 'FEED_FLOW',
  permeate_flow: 'PERM_FLOW',
  concentrate_flow: 'CONC_FLOW',
  feed_conductivity: 'FEED_COND',
  permeate_conductivity: 'PERM_COND',
  feed_temperature: 'FEED_TEMP',
};

export const baseUnit: Record<Quantity, Unit> = {
  run_status: '',
  feed_pressure: 'bar',
  concentrate_pressure: 'bar',
  permeate_pressure: 'bar',
  feed_flow: 'm3/h',
  permeate_flow: 'm3/h',
  concentrate_flow: 'm3/h',
  feed_conductivity: 'uS/cm',
  permeate_conductivity: 'uS/cm',
  feed_temperature: 'degC',
};

export interface Range {
  min: number;
  max: number;
}

export interface WeibullLife {
  shape: number;
  scaleDays: number;
}

export interface StageDesign {
  index: StageIndex;
  vessels: number;
  elementsPerVessel: number;
  designFeedM3h: number;
  designPermeateM3h: number;
  /** Net driving pressure giving the design permeate flow at 25 °C with clean new elements. */
  designNdpBar: number;
  /** Feed-to-concentrate pressure drop at design flows with clean elements. */
  designDpBar: number;
  permeatePressureBar: number;
  /** Permeate over feed-brine average concentration at design permeate flow with new elements. */
  designSaltPassage: number;
  elementLife: WeibullLife;
  /** Reversible (cleanable) permeability loss per 30 days of running; a new rate is drawn after each cleaning. */
  foulingPerMonth: Range;
  /** Relative rise of differential pressure per 30 days of running; a new rate after each cleaning. */
  dpRisePerMonth: Range;
  /** Permanent permeability loss per year of element age (reset when the element is replaced). */
  irreversibleLossPerYear: number;
  /** Relative rise of the salt-transport coefficient per year of element age. */
  saltPassageRisePerYear: number;
  /** Relative rise of salt transport per unit of reversible fouling (polarization at the fouled surface). */
  saltPassagePerFouling: number;
}

export interface FailureMode {
  code: string;
  share: number;
  repairMedianHours: number;
  repairSigma: number;
  partsCost: Range;
  description: string;
}

export interface PumpDesign {
  suffix: 'HPP' | 'IBP';
  name: string;
  /** Planted exponential failure process, mean operating hours between failures. */
  mtbfHours: number;
  serviceIntervalDays: number;
  failureModes: readonly FailureMode[];
}

export interface InstrumentDesign {
  suffix: string;
  name: string;
  /** What the instrument measures: stage quantities, keyed `S1.feed_flow`. */
  measures: readonly `S${StageIndex}.${StageQuantity}`[];
  /** Conductivity analysers drift; the others fail outright. */
  failure: 'drift' | 'fail';
}

export interface TrainDesign {
  code: TrainCode;
  name: string;
  commissionedAt: string;
  ratedPermeateM3h: number;
  qualityStyle: QualityStyle;
  /** Units other than the base unit, keyed `S1.feed_pressure`; values are written in these units. */
  unitOverrides: Partial<Record<`S${StageIndex}.${StageQuantity}`, Unit>>;
  boostBar: number;
  pumps: readonly PumpDesign[];
}

export interface ElementModel {
  name: string;
  serialPrefix: string;
  price: Range;
}

export interface JobStepDesign {
  name: string;
  medianMinutes: number;
  /** Done by the lead technician, else by the partner. */
  byLead: boolean;
}

const hppFailureModes: readonly FailureMode[] = [
  {
    code: 'SEAL-LEAK',
    share: 0.45,
    repairMedianHours: 6,
    repairSigma: 0.35,
    partsCost: { min: 1450, max: 2100 },
    description: 'Mechanical seal leaking at the drive end; seal cartridge replaced',
  },
  {
    code: 'BRG-WEAR',
    share: 0.25,
    repairMedianHours: 11,
    repairSigma: 0.3,
    partsCost: { min: 780, max: 1150 },
    description: 'Bearing noise and vibration above limit; bearings replaced and shaft aligned',
  },
  {
    code: 'MOTOR-TRIP',
    share: 0.15,
    repairMedianHours: 1.5,
    repairSigma: 0.5,
    partsCost: { min: 0, max: 120 },
    description: 'Motor overload trip; winding insulation tested, overload relay reset',
  },
  {
    code: 'CPLG-WEAR',
    share: 0.15,
    repairMedianHours: 4.5,
    repairSigma: 0.3,
    partsCost: { min: 240, max: 420 },
    description: 'Coupling insert worn; insert replaced and alignment checked',
  },
];

const ibpFailureModes: readonly FailureMode[] = [
  {
    code: 'SEAL-LEAK',
    share: 0.4,
    repairMedianHours: 5,
    repairSigma: 0.35,
    partsCost: { min: 900, max: 1400 },
    description: 'Booster pump seal weeping; seal replaced',
  },
  {
    code: 'BRG-WEAR',
    share: 0.3,
    repairMedianHours: 9,
    repairSigma: 0.3,
    partsCost: { min: 520, max: 880 },
    description: 'Booster pump bearing worn; bearings replaced',
  },
  {
    code: 'VFD-FAULT',
    share: 0.3,
    repairMedianHours: 3,
    repairSigma: 0.45,
    partsCost: { min: 0, max: 650 },
    description: 'Drive fault on the booster pump variable-speed drive; drive reset, fan replaced',
  },
];

const instruments: readonly InstrumentDesign[] = [
  { suffix: 'FIT-F', name: 'feed flow transmitter', measures: ['S1.feed_flow'], failure: 'fail' },
  {
    suffix: 'FIT-C1',
    name: 'interstage flow transmitter',
    measures: ['S1.concentrate_flow', 'S2.feed_flow'],
    failure: 'fail',
  },
  { suffix: 'FIT-C2', name: 'concentrate flow transmitter', measures: ['S2.concentrate_flow'], failure: 'fail' },
  { suffix: 'FIT-P1', name: 'stage 1 permeate flow transmitter', measures: ['S1.permeate_flow'], failure: 'fail' },
  { suffix: 'FIT-P2', name: 'stage 2 permeate flow transmitter', measures: ['S2.permeate_flow'], failure: 'fail' },
  { suffix: 'CIT-F', name: 'feed conductivity analyser', measures: ['S1.feed_conductivity'], failure: 'drift' },
  {
    suffix: 'CIT-C1',
    name: 'interstage conductivity analyser',
    measures: ['S2.feed_conductivity'],
    failure: 'drift',
  },
  {
    suffix: 'CIT-P1',
    name: 'stage 1 permeate conductivity analyser',
    measures: ['S1.permeate_conductivity'],
    failure: 'drift',
  },
  {
    suffix: 'CIT-P2',
    name: 'stage 2 permeate conductivity analyser',
    measures: ['S2.permeate_conductivity'],
    failure: 'drift',
  },
  {
    suffix: 'TT-F',
    name: 'feed temperature transmitter',
    measures: ['S1.feed_temperature', 'S2.feed_temperature'],
    failure: 'fail',
  },
  {
    suffix: 'PIT-R',
    name: 'pressure transmitter rack',
    measures: [
      'S1.feed_pressure',
      'S1.concentrate_pressure',
      'S1.permeate_pressure',
      'S2.feed_pressure',
      'S2.concentrate_pressure',
      'S2.permeate_pressure',
    ],
    failure: 'fail',
  },
];

export const demoPlant = {
  site: {
    code: 'TFD',
    name: 'Tamsel Flats brackish-water desalter',
    utility: 'Tamsel Flats Water Cooperative',
    town: 'Tamsel Flats',
    timeZone: 'America/Denver',
  },
  /** Rack of each train: 4 rows × 4 columns, stage 1 vessels first in row-major order. */
  rack: { rows: 4, cols: 4 },
  stages: [
    {
      index: 1,
      vessels: 10,
      elementsPerVessel: 7,
      designFeedM3h: 100,
      designPermeateM3h: 50,
      designNdpBar: 6.0,
      designDpBar: 1.4,
      permeatePressureBar: 1.0,
      designSaltPassage: 0.012,
      elementLife: { shape: 2.2, scaleDays: 1400 },
      foulingPerMonth: { min: 0.022, max: 0.038 },
      dpRisePerMonth: { min: 0.025, max: 0.05 },
      irreversibleLossPerYear: 0.04,
      saltPassageRisePerYear: 0.1,
      saltPassagePerFouling: 0.6,
    },
    {
      index: 2,
      vessels: 6,
      elementsPerVessel: 7,
      designFeedM3h: 50,
      designPermeateM3h: 25,
      designNdpBar: 4.5,
      designDpBar: 1.1,
      permeatePressureBar: 0.3,
      designSaltPassage: 0.015,
      elementLife: { shape: 1.8, scaleDays: 1900 },
      foulingPerMonth: { min: 0.015, max: 0.03 },
      dpRisePerMonth: { min: 0.02, max: 0.05 },
      irreversibleLossPerYear: 0.035,
      saltPassageRisePerYear: 0.12,
      saltPassagePerFouling: 0.6,
    },
  ] satisfies readonly StageDesign[],
  trains: [
    {
      code: 'T1',
      name: 'Train 1',
      commissionedAt: '2008-04-14T15:00:00Z',
      ratedPermeateM3h: 75,
      qualityStyle: 'words',
      unitOverrides: { 'S2.concentrate_pressure': 'kPa', 'S2.permeate_flow': 'gpm' },
      boostBar: 1.6,
      pumps: [
        {
          suffix: 'HPP',
          name: 'high-pressure pump',
          mtbfHours: 2800,
          serviceIntervalDays: 182,
          failureModes: hppFailureModes,
        },
        {
          suffix: 'IBP',
          name: 'interstage booster pump',
          mtbfHours: 5200,
          serviceIntervalDays: 182,
          failureModes: ibpFailureModes,
        },
      ],
    },
    {
      code: 'T2',
      name: 'Train 2',
      commissionedAt: '2010-06-07T15:00:00Z',
      ratedPermeateM3h: 75,
      qualityStyle: 'opc',
      unitOverrides: {
        'S1.feed_pressure': 'psi',
        'S1.concentrate_pressure': 'psi',
        'S1.permeate_pressure': 'psi',
        'S2.feed_pressure': 'psi',
        'S2.concentrate_pressure': 'psi',
        'S2.permeate_pressure': 'psi',
        'S1.concentrate_flow': 'L/s',
        'S1.feed_conductivity': 'mS/cm',
        'S1.feed_temperature': 'degF',
        'S2.feed_temperature': 'degF',
      },
      boostBar: 1.6,
      pumps: [
        {
          suffix: 'HPP',
          name: 'high-pressure pump',
          mtbfHours: 3400,
          serviceIntervalDays: 182,
          failureModes: hppFailureModes,
        },
        {
          suffix: 'IBP',
          name: 'interstage booster pump',
          mtbfHours: 4600,
          serviceIntervalDays: 182,
          failureModes: ibpFailureModes,
        },
      ],
    },
  ] satisfies readonly TrainDesign[],
  instruments,
  elements: {
    /** Models in the register; the plant switched to the second one for installs from this date on. */
    models: [
      { name: 'Osprelle 8-370', serialPrefix: 'OA', price: { min: 640, max: 700 } },
      { name: 'Osprelle 8-400 LF', serialPrefix: 'OB', price: { min: 690, max: 760 } },
    ] satisfies readonly ElementModel[],
    modelSwitchAt: '2017-01-01T00:00:00Z',
    /** Share of installs after the switch that still used old stock of the first model. */
    oldStockShare: 0.1,
    /** Which life-ending reason a Weibull life end is recorded as. Model has no planted effect on life. */
    lifeEndingReasons: { failed: 0.35, performance: 0.5, damaged: 0.15 },
    /** Independent censoring: exponential time to a censoring removal, in days. */
    censorMeanDays: 15000,
    censorReasons: { planned: 0.5, sampled: 0.3, relocated: 0.2 },
    /** Removals are done on the day shift: a life end outside 07:00–15:00 local waits for the next shift. */
    dayShift: { fromHour: 7, toHour: 15 },
    /** A life ending within this many hours of the data end is still in service at the end. */
    inServiceTailHours: 24,
    sealKitCost: 45,
  },
  pumpsRepair: {
    responseMedianHours: 1.2,
    responseSigma: 0.5,
    restartMinutes: { min: 10, max: 30 },
    duplicateShare: 0.12,
  },
  vessels: {
    /** Interconnector O-ring leaks per train: calendar-time exponential. */
    oringMeanIntervalDays: 240,
    oringRepairHours: { min: 3, max: 5 },
    oringConductivityFactor: { min: 1.2, max: 1.5 },
    breachConductivityFactor: { min: 1.3, max: 2.0 },
  },
  filters: {
    changeIntervalDays: { min: 28, max: 35 },
    changeHours: { min: 1, max: 2 },
    highDpMeanIntervalDays: 120,
    cartridgeSetCost: { min: 240, max: 300 },
  },
  cleaning: {
    intervalDays: { min: 90, max: 150 },
    durationHours: { min: 8, max: 14 },
    foulingRecovered: { min: 0.6, max: 0.9 },
    dpRiseRecovered: { min: 0.6, max: 0.85 },
    chemicalCost: { min: 1100, max: 1600 },
  },
  pumpService: { durationMedianHours: 5, durationSigma: 0.2, partsCost: { min: 180, max: 400 } },
  vesselInspection: { intervalDays: 365, durationHours: { min: 5, max: 8 } },
  instrumentsMaintenance: {
    calibrationIntervalDays: 182,
    calibrationHours: { min: 1, max: 2.5 },
    driftMeanIntervalDays: 300,
    driftDetectDays: { min: 10, max: 40 },
    driftAtDetection: { min: 0.04, max: 0.12 },
    failMeanIntervalDays: 900,
    failRepairHours: { min: 1, max: 4 },
    partsCost: { min: 60, max: 900 },
  },
  predictive: { intervalDays: 91, hours: { min: 0.5, max: 1.5 } },
  trips: { meanIntervalDays: 45, minutes: { min: 15, max: 90 } },
  commsOutages: { meanIntervalDays: 120, hours: { min: 0.5, max: 3 } },
  sampleQuality: { uncertainShare: 0.0015, badShare: 0.0005 },
  environment: {
    temperatureMeanC: 20,
    temperatureAmplitudeC: 7.5,
    temperatureColdestDayOfYear: 35,
    temperatureAnomalyC: 0.7,
    temperatureAnomalyDays: 3,
    conductivityMeanUsCm: 2250,
    conductivityAmplitudeUsCm: 380,
    conductivityPeakDayOfYear: 290,
    conductivityAnomalyUsCm: 150,
    conductivityAnomalyDays: 10,
    conductivityLimitsUsCm: { min: 1500, max: 3000 },
  },
  control: {
    /** Daily feed-pressure setpoint = design + gain × (pressure needed for design flow − design). */
    pressureTrimGain: 0.6,
    feedPressureLimitsBar: { min: 7, max: 16 },
  },
  crews: {
    mechanical: {
      'crew-a': ['tech-01', 'tech-02', 'tech-03'],
      'crew-b': ['tech-04', 'tech-05', 'tech-06'],
      'crew-c': ['tech-07', 'tech-08', 'tech-09'],
    },
    instrument: { 'crew-i': ['tech-10', 'tech-11'] },
    mechanicalRatePerHour: 74,
    instrumentRatePerHour: 86,
  },
  jobs: {
    steps: [
      { name: 'Stop the train, isolate, lock out and depressurize', medianMinutes: 35, byLead: true },
      { name: 'Permit and PPE check', medianMinutes: 12, byLead: true },
      { name: 'Open vessel end caps', medianMinutes: 30, byLead: true },
      { name: 'Push elements out in flow direction', medianMinutes: 45, byLead: true },
      { name: 'Inspect elements, adapters and vessel bore', medianMinutes: 25, byLead: false },
      { name: 'Lubricate brine seals and O-rings with the approved lubricant', medianMinutes: 12, byLead: false },
      { name: 'Load elements in flow direction, brine seal facing the feed', medianMinutes: 50, byLead: true },
      { name: 'Fit interconnectors and end adapters', medianMinutes: 25, byLead: false },
      { name: 'Close vessel and secure end-cap locking rings', medianMinutes: 25, byLead: true },
      { name: 'Leak check at low pressure and restart', medianMinutes: 40, byLead: true },
    ] satisfies readonly JobStepDesign[],
    /** Index (0-based) of the step at whose end the old element leaves and the new one is logged in. */
    swapAfterStep: 3,
    stepSigma: 0.3,
    jobSigma: 0.15,
    gapMinutes: { min: 0, max: 6 },
    /**
     * Guided jobs: duration × guidedFactor × (1 + learningExtra × exp(−(k − 1) / learningJobs)),
     * k = the lead technician's count of guided jobs so far (1 for the first). Unguided jobs: × 1.
     */
    guidedFactor: 0.8,
    learningExtra: 0.3,
    learningJobs: 3,
    /** Share of jobs done with the written procedure open rises linearly over the history window. */
    guidedShare: { atStart: 0.2, atEnd: 0.8 },
    /** In a guided job the permit check is sometimes done before the procedure is opened. */
    permitStepUnguidedShare: 0.3,
  },
  improvements: [
    { at: 0.08, asset: 'T1-S2', status: 'closed', days: 2, description: 'Fit permeate sample valves on every stage 2 vessel' },
    { at: 0.21, asset: 'T2-HPP', status: 'closed', days: 1, description: 'Move the drive keypad to a remote panel outside the pump bay' },
    { at: 0.37, asset: 'T2-S1', status: 'closed', days: 1, description: 'Add an interstage pressure gauge beside the transmitter' },
    { at: 0.52, asset: 'T1', status: 'closed', days: 3, description: 'Relabel vessel rack positions to match the revised drawing' },
    { at: 0.66, asset: 'T1-CF', status: 'cancelled', days: 0, description: 'Install a duplex cartridge filter housing' },
    { at: 0.9, asset: 'T2-CIT-P2', status: 'in_progress', days: 0, description: 'Add a grab-sample point beside the permeate analyser' },
    { at: 0.95, asset: 'T2-S1-V01', status: 'open', days: 0, description: 'Trial the low-fouling element model in one vessel' },
    { at: 0.97, asset: 'T1', status: 'open', days: 0, description: 'Upgrade the cleaning-tank heater controls' },
  ] as const,
} as const;

export type DemoPlant = typeof demoPlant;

export interface AssetRow {
  code: string;
  name: string;
  kind: AssetKind;
  parent: string | null;
  ratedPermeateM3h: number | null;
  elementCapacity: number | null;
  rackRow: number | null;
  rackCol: number | null;
}

export interface TagRow {
  tag: string;
  asset: string;
  quantity: Quantity;
  unit: Unit;
  train: TrainCode;
  /** Stage index for stage tags; null for run-status tags. */
  stage: StageIndex | null;
  /** Pump suffix for pump run-status tags. */
  pump: 'HPP' | 'IBP' | null;
  qualityStyle: QualityStyle;
}

export function stageCode(train: TrainCode, stage: StageIndex): string {
  return `${train}-S${stage}`;
}

export function vesselCode(train: TrainCode, stage: StageIndex, vessel: number): string {
  return `${stageCode(train, stage)}-V${String(vessel).padStart(2, '0')}`;
}

export function pumpCode(train: TrainCode, suffix: 'HPP' | 'IBP'): string {
  return `${train}-${suffix}`;
}

/** The asset register: site → train → stage → vessel, and train → pump / filter / instrument. */
export function plantAssets(plant: DemoPlant = demoPlant): AssetRow[] {
  const rows: AssetRow[] = [];
  const empty = { ratedPermeateM3h: null, elementCapacity: null, rackRow: null, rackCol: null };
  for (const train of plant.trains) {
    rows.push({
      code: train.code,
      name: train.name,
      kind: 'train',
      parent: null,
      ...empty,
      ratedPermeateM3h: train.ratedPermeateM3h,
    });
    let slot = 0;
    for (const stage of plant.stages) {
      rows.push({
        code: stageCode(train.code, stage.index),
        name: `${train.name} stage ${stage.index}`,
        kind: 'stage',
        parent: train.code,
        ...empty,
      });
      for (let v = 1; v <= stage.vessels; v++) {
        rows.push({
          code: vesselCode(train.code, stage.index, v),
          name: `${train.name} stage ${stage.index} vessel ${String(v).padStart(2, '0')}`,
          kind: 'vessel',
          parent: stageCode(train.code, stage.index),
          ratedPermeateM3h: null,
          elementCapacity: stage.elementsPerVessel,
          rackRow: Math.floor(slot / plant.rack.cols) + 1,
          rackCol: (slot % plant.rack.cols) + 1,
        });
        slot++;
      }
    }
    for (const pump of train.pumps) {
      rows.push({
        code: pumpCode(train.code, pump.suffix),
        name: `${train.name} ${pump.name}`,
        kind: 'pump',
        parent: train.code,
        ...empty,
      });
    }
    rows.push({ code: `${train.code}-CF`, name: `${train.name} cartridge filter`, kind: 'filter', parent: train.code, ...empty });
    for (const instrument of plant.instruments) {
      rows.push({
        code: `${train.code}-${instrument.suffix}`,
        name: `${train.name} ${instrument.name}`,
        kind: 'instrument',
        parent: train.code,
        ...empty,
      });
    }
  }
  return rows;
}

/** The tag map, in the column order of the historian rows. */
export function plantTags(plant: DemoPlant = demoPlant): TagRow[] {
  const rows: TagRow[] = [];
  for (const train of plant.trains) {
    const common = { train: train.code, qualityStyle: train.qualityStyle } as const;
    rows.push({ tag: `${train.code}.RUN`, asset: train.code, quantity: 'run_status', unit: '', stage: null, pump: null, ...common });
    for (const pump of train.pumps) {
      rows.push({
        tag: `${train.code}.${pump.suffix}.RUN`,
        asset: pumpCode(train.code, pump.suffix),
        quantity: 'run_status',
        unit: '',
        stage: null,
        pump: pump.suffix,
        ...common,
      });
    }
    for (const stage of plant.stages) {
      for (const quantity of stageQuantities) {
        const overrides: Partial<Record<string, Unit>> = train.unitOverrides;
        rows.push({
          tag: `${train.code}.S${stage.index}.${stageTagSuffix[quantity]}`,
          asset: stageCode(train.code, stage.index),
          quantity,
          unit: overrides[`S${stage.index}.${quantity}`] ?? baseUnit[quantity],
          stage: stage.index,
          pump: null,
          ...common,
        });
      }
    }
  }
  return rows;
}
