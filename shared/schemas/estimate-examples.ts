/**
 * Estimate requests from the demo scenario (invented customers, invented SKUs). The API docs,
 * the tests and the benchmark all start from these, so they stay one set of numbers.
 */
// Plain data, imported by the estimate schema for its examples: nothing here imports the schema
// back. tests/unit/estimate-examples.test.ts checks each against its schema's type and parse.

/** HL-K20: 20 CV outputs at 1.5 A, one data output of 800 pixels, PNP inputs at 5 V / 12 mA. */
export const hlK20Profile = {
  outputs: 20,
  maxCurrentPerOutputA: 1.5,
  dataOutputs: 1,
  maxPixelsPerOutput: 800,
  sensorInput: { type: 'pnp', supplyV: 5, maxCurrentMa: 12 },
  sensorInputs: 2,
} as const;

/** HL-K36: 36 CV outputs at 1.2 A, two data outputs of 600 pixels each. */
export const hlK36Profile = { outputs: 36, maxCurrentPerOutputA: 1.2, dataOutputs: 2, maxPixelsPerOutput: 600 } as const;

/** HL-M05: PIR sensor, 5 V, PNP, 8 mA. */
export const hlM05Motion = { outputType: 'pnp', supplyV: 5, currentMa: 8 } as const;

/** Alder Row townhouse (Kestrel & Finch Builders): one straight flight of 14 treads. */
export const alderRowStair = { treads: 14, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250 } as const;

/** HL-S24-10: 24 V, 10 W/m, cut every 50 mm. */
export const hlS2410Strip = { voltageV: 24, powerWPerM: 10, cutPitchMm: 50, sku: 'HL-S24-10' } as const;

export const alderRowTownhouse = {
  layout: 'tread-strips',
  staircase: alderRowStair,
  treadStrip: hlS2410Strip,
  controller: { profile: hlK20Profile },
  sensors: { motion: hlM05Motion },
} as const;

/** Alder Row corner unit: the stair turns at a 900 mm landing, 7 + 8 treads. */
export const alderRowCornerUnit = {
  layout: 'tread-strips',
  staircase: { ...alderRowStair, treads: 15, flights: [{ treads: 7, landingLengthMm: 900 }, { treads: 8 }] },
  treadStrip: hlS2410Strip,
  controller: { profile: hlK20Profile },
  sensors: { motion: hlM05Motion },
} as const;

/** Quayside Studio: 18 m office corridor, handrail pixel run, lights off above 80 lx of daylight. */
export const quaysideCorridor = {
  layout: 'rail-pixels',
  railPixels: { lengthM: 18, pixelsPerM: 60, voltageV: 5, protocol: 'one-wire-800k', brightnessPercent: 50, sku: 'HL-P05-60' },
  controller: { profile: hlK36Profile },
  sensors: { motion: hlM05Motion, daylightCutoffLux: 80 },
} as const;

/** Harbor Lane Lighting's catalog (EUR). Prices the scenario does not give are left out. */
export const harborLaneCatalog = {
  currency: 'EUR',
  items: [
    { sku: 'HL-S24-10', kind: 'strip', description: 'CV strip 24 V 10 W/m, 3000 K, 5 m reel', unitPrice: 39, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, colourTemperatureK: 3000, reelLengthMm: 5000 },
    { sku: 'HL-S12-07', kind: 'strip', description: 'CV strip 12 V 7.2 W/m, 4000 K, 5 m reel', unitPrice: 29, voltageV: 12, powerWPerM: 7.2, cutPitchMm: 25, colourTemperatureK: 4000, reelLengthMm: 5000 },
    { sku: 'HL-P05-60', kind: 'pixel-strip', description: 'Pixel strip 5 V 60 pixels/m, 5 m reel', unitPrice: 45, voltageV: 5, pixelsPerM: 60, protocol: 'one-wire-800k', reelLengthMm: 5000 },
    { sku: 'HL-P24-20', kind: 'pixel-strip', description: 'Pixel strip 24 V 20 pixels/m, 5 m reel', unitPrice: 52, voltageV: 24, pixelsPerM: 20, reelLengthMm: 5000 },
    { sku: 'HL-D24-060', kind: 'driver', unitPrice: 24, voltageV: 24, ratingW: 60 },
    { sku: 'HL-D24-100', kind: 'driver', unitPrice: 34, voltageV: 24, ratingW: 100 },
    { sku: 'HL-D24-150', kind: 'driver', unitPrice: 46, voltageV: 24, ratingW: 150 },
    { sku: 'HL-D24-240', kind: 'driver', unitPrice: 71, voltageV: 24, ratingW: 240 },
    { sku: 'HL-D12-100', kind: 'driver', unitPrice: 33, voltageV: 12, ratingW: 100 },
    { sku: 'HL-D05-200', kind: 'driver', unitPrice: 49, voltageV: 5, ratingW: 200 },
    { sku: 'HL-C050', kind: 'cable', description: '2-core flexible copper 0.5 mm²', unitPrice: 0.6, crossSectionMm2: 0.5 },
    { sku: 'HL-C075', kind: 'cable', description: '2-core flexible copper 0.75 mm²', unitPrice: 0.8, crossSectionMm2: 0.75 },
    { sku: 'HL-C100', kind: 'cable', description: '2-core flexible copper 1.0 mm²', unitPrice: 1, crossSectionMm2: 1 },
    { sku: 'HL-C150', kind: 'cable', description: '2-core flexible copper 1.5 mm²', unitPrice: 1.4, crossSectionMm2: 1.5 },
    { sku: 'HL-C3-050', kind: 'cable', description: '3-core flexible copper 0.5 mm² (sensor cable)', unitPrice: 0.9, crossSectionMm2: 0.5, cores: 3 },
    { sku: 'HL-K20', kind: 'controller', description: 'Stair controller, 20 outputs', unitPrice: 119, profile: hlK20Profile },
    { sku: 'HL-K36', kind: 'controller', description: 'Stair controller, 36 outputs', unitPrice: 179, profile: hlK36Profile },
    { sku: 'HL-M05', kind: 'motion-sensor', description: 'PIR sensor 5 V PNP', unitPrice: 12.5, ...hlM05Motion },
    { sku: 'HL-L01', kind: 'daylight-sensor', description: 'Daylight sensor', unitPrice: 9.9 },
    { sku: 'HL-F06', kind: 'fuse', description: 'Inline fuse holder with 6.3 A fuse', unitPrice: 3.2, ratingA: 6.3 },
    { sku: 'HL-F10', kind: 'fuse', description: 'Inline fuse holder with 10 A fuse', unitPrice: 3.6, ratingA: 10 },
    { sku: 'HL-DL2', kind: 'data-line', description: 'Differential data link, transmitter and receiver', unitPrice: 14, part: 'differential-link' },
    { sku: 'HL-LS1', kind: 'data-line', description: 'Level shifter 3.3 V to 5 V, one output', unitPrice: 6.5, part: 'level-shifter' },
    { sku: 'HL-A100', kind: 'aluminium-profile', description: 'Aluminium profile with diffuser, 1 m', unitPrice: 8.5, lengthMm: 1000 },
    { sku: 'HL-E02', kind: 'end-caps', description: 'End caps, pair', unitPrice: 0.9 },
  ],
} as const;

/** Harbor Lane's product page: the Alder Row stair priced from the shop's own catalog. */
export const harborLaneCheckout = {
  layout: 'tread-strips',
  staircase: alderRowStair,
  treadStrip: hlS2410Strip,
  controller: { profileId: 'HL-K20' },
  sensors: { motion: hlM05Motion },
  profiles: true,
  catalog: harborLaneCatalog,
} as const;

/** Alder Row with a 24 V handrail pixel run that moves with the treads. */
export const alderRowWithRail = {
  layout: 'treads-and-rail',
  staircase: alderRowStair,
  treadStrip: hlS2410Strip,
  railPixels: { lengthM: 4.5, pixelsPerM: 20, voltageV: 24, protocol: 'one-wire-800k', currentPerPixelMa: 12, sku: 'HL-P24-20' },
  controller: { profile: hlK20Profile },
  sensors: { motion: hlM05Motion },
} as const;

/** A pixel segment on every Alder Row tread, chained tread to tread. */
export const alderRowTreadPixels = {
  layout: 'tread-pixels',
  staircase: alderRowStair,
  treadPixels: { pixelsPerM: 20, voltageV: 24, protocol: 'one-wire-800k', currentPerPixelMa: 12, cutPitchMm: 50, sku: 'HL-P24-20' },
  controller: { profile: hlK20Profile },
  sensors: { motion: hlM05Motion },
} as const;

/**
 * The response to `alderRowTownhouse`, shortened for the API docs: three of the fourteen tread
 * rows, two of the CV outputs and a few trace entries. A unit test keeps it in step with the engine.
 */
export const alderRowTownhouseResponse = {
  engineVersion: '2.1.0',
  layout: 'tread-strips',
  summary: {
    treads: 14,
    litTreads: 14,
    controllers: 1,
    totalLoadW: 119,
    driverCount: 1,
    longestRunM: 2.677,
    longestFeederM: 2,
    worstDropPercent: 2.399,
    motionSensors: 2,
    reels: 3,
    checks: {
      pass: 16,
      warn: 1,
      fail: 0
    }
  },
  treads: [
    {
      index: 1,
      stripLengthMm: 850,
      powerW: 8.5,
      currentA: 0.3542,
      controller: 1,
      output: 1,
      cableKind: 'tread-lead',
      cableLengthM: 2.366,
      dropPercent: 0.34,
      crossSectionMm2: 0.5,
      pathDropPercent: 2.355
    },
    {
      index: 7,
      stripLengthMm: 850,
      powerW: 8.5,
      currentA: 0.3542,
      controller: 1,
      output: 7,
      cableKind: 'tread-lead',
      cableLengthM: 0.5,
      dropPercent: 0.072,
      crossSectionMm2: 0.5,
      pathDropPercent: 2.086
    },
    {
      index: 14,
      stripLengthMm: 850,
      powerW: 8.5,
      currentA: 0.3542,
      controller: 1,
      output: 14,
      cableKind: 'tread-lead',
      cableLengthM: 2.677,
      dropPercent: 0.385,
      crossSectionMm2: 0.5,
      pathDropPercent: 2.399
    }
  ],
  outputs: {
    controllers: 1,
    controllerTreads: [
      {
        controller: 1,
        firstTread: 1,
        lastTread: 14,
        atTread: 7,
        currentA: 4.9583
      }
    ],
    cvOutputsPerController: 20,
    maxCurrentPerOutputA: 1.5,
    maxOutputCurrentA: 0.3542,
    cv: [
      {
        controller: 1,
        output: 1,
        treads: [
          1
        ],
        currentA: 0.3542,
        withinLimit: true
      },
      {
        controller: 1,
        output: 2,
        treads: [
          2
        ],
        currentA: 0.3542,
        withinLimit: true
      }
    ],
    dataOutputsPerController: 1,
    data: []
  },
  drivers: [
    {
      voltageV: 24,
      loads: [
        'tread strips'
      ],
      loadW: 119,
      currentA: 4.9583,
      requiredRatingW: 148.75,
      maxLoadingPercent: 80,
      drivers: [
        {
          ratingW: 150,
          count: 1,
          loadW: 119,
          loadingPercent: 79.3333
        }
      ],
      driverCount: 1,
      totalRatingW: 150,
      loadingPercent: 79.3333,
      maxSupplyW: null,
      circuits: 1,
      ratingsSource: 'default'
    }
  ],
  circuits: [
    {
      circuit: 1,
      name: 'controller 1',
      voltageV: 24,
      loads: [
        'tread strips'
      ],
      loadW: 119,
      currentA: 4.9583,
      driver: {
        ratingW: 150,
        loadingPercent: 79.3333,
        currentLimitA: 9.375
      },
      driverPositionM: 1.866,
      feeds: 1,
      worstPathDropPercent: 2.399,
      fusesA: [
        6.3
      ],
      protectedBy: 'driver current limit'
    }
  ],
  feeder: {
    lengthM: 2,
    lengthDefaulted: true,
    runs: [
      {
        voltageV: 24,
        to: 'controller',
        controller: 1,
        count: 1,
        currentA: 4.9583,
        lengthM: 2,
        dropV: 0.4834,
        dropPercent: 2.014,
        currentRatingA: 10,
        maxInputCurrentA: null,
        circuit: 1,
        powerInput: null,
        feedPoint: null,
        positionM: 1.866,
        alongRunM: 0,
        pathDropPercent: 2.399,
        fuseA: 6.3,
        protectedBy: 'driver current limit',
        crossSectionMm2: 1
      }
    ]
  },
  pixels: {
    rail: null,
    treads: null,
    railGrouping: null
  },
  reels: {
    treads: {
      reels: 3,
      reelLengthMm: 5000,
      plan: [
        {
          reel: 1,
          piecesMm: [
            850,
            850,
            850,
            850,
            850
          ],
          pieceIndexes: [
            0,
            1,
            2,
            3,
            4
          ],
          wasteMm: 750
        },
        {
          reel: 2,
          piecesMm: [
            850,
            850,
            850,
            850,
            850
          ],
          pieceIndexes: [
            5,
            6,
            7,
            8,
            9
          ],
          wasteMm: 750
        },
        {
          reel: 3,
          piecesMm: [
            850,
            850,
            850,
            850
          ],
          pieceIndexes: [
            10,
            11,
            12,
            13
          ],
          wasteMm: 1600
        }
      ],
      totalWasteMm: 3100,
      lowerBoundReels: 3,
      provenOptimal: true,
      method: 'identical-pieces',
      unplaceableTreads: [],
      sku: 'HL-S24-10'
    },
    rail: null
  },
  cables: [
    {
      cores: 2,
      use: 'tread leads',
      runs: 14,
      totalLengthM: 22.239,
      orderLengthM: 23,
      crossSectionMm2: 0.5
    },
    {
      cores: 2,
      use: 'feeders',
      runs: 1,
      totalLengthM: 2,
      orderLengthM: 2,
      crossSectionMm2: 1
    }
  ],
  sensors: {
    motionSensors: 2,
    placements: [
      {
        role: 'foot',
        flight: 1,
        tread: 1,
        cableLengthM: 2.366
      },
      {
        role: 'head',
        flight: 1,
        tread: 14,
        cableLengthM: 2.677
      }
    ],
    motion: {
      outputType: 'pnp',
      supplyV: 5,
      currentMa: 8,
      source: 'request'
    },
    controllerInput: {
      type: 'pnp',
      supplyV: 5,
      maxCurrentMa: 12,
      source: 'profile'
    },
    typeMatch: true,
    needsInterface: false,
    supplyMatch: true,
    currentOk: true,
    totalSensorCurrentMa: 16,
    daylightSensors: 1,
    daylightCutoffLux: 50,
    daylightCutoffDefaulted: true,
    sensorCableM: 5.043
  },
  bom: [
    {
      category: 'strip',
      description: 'CV strip 24 V 10 W/m, cut pitch 50 mm, 5 m reel',
      quantity: 3,
      unit: 'reel',
      sku: 'HL-S24-10'
    },
    {
      category: 'driver',
      description: 'LED driver 24 V 150 W, one per circuit (circuit 1); never parallel their outputs',
      quantity: 1,
      unit: 'pcs'
    },
    {
      category: 'fuse',
      description: 'Inline fuse holder with 6.3 A fuse, at the driver output of a feeder',
      quantity: 1,
      unit: 'pcs'
    },
    {
      category: 'controller',
      description: 'Stair controller (profile sent inline)',
      quantity: 1,
      unit: 'pcs'
    },
    {
      category: 'motion-sensor',
      description: 'PIR motion sensor, PNP output, 5 V, 8 mA',
      quantity: 2,
      unit: 'pcs'
    },
    {
      category: 'daylight-sensor',
      description: 'Ambient-light sensor for the 50 lx cut-off',
      quantity: 1,
      unit: 'pcs'
    },
    {
      category: 'cable',
      description: '2-core copper cable 0.5 mm²',
      quantity: 23,
      unit: 'm'
    },
    {
      category: 'cable',
      description: '2-core copper cable 1 mm²',
      quantity: 2,
      unit: 'm'
    },
    {
      category: 'cable',
      description: '3-core sensor cable (supply, 0 V, signal) 0.5 mm², 2 runs',
      quantity: 6,
      unit: 'm'
    }
  ],
  checks: [
    {
      id: 'tread-count-range',
      status: 'pass',
      message: '14 treads: the profile sets no tread limit.',
      value: 14,
      limit: '1 or more',
      unit: 'treads',
      reference: 'controller profile'
    },
    {
      id: 'strip-fits-tread',
      status: 'pass',
      message: '850 mm (17 × 50 mm) fits the 860 mm between the end clearances.',
      value: 850,
      limit: 860,
      unit: 'mm',
      reference: 'strip cut only at its marked cut points (strip datasheet); end clearance 20 mm by default (common practice, no published source)'
    },
    {
      id: 'output-count',
      status: 'pass',
      message: "14 treads use 14 of the controller's 20 outputs.",
      value: 14,
      limit: 20,
      unit: 'outputs',
      reference: 'controller profile'
    },
    {
      id: 'output-current',
      status: 'pass',
      message: 'The busiest output carries 0.354 A of the 1.5 A allowed.',
      value: 0.3542,
      limit: 1.5,
      unit: 'A',
      reference: 'controller profile'
    },
    {
      id: 'controller-input-current',
      status: 'warn',
      message: 'The profile gives no maximum input current; 4.958 A of strip current passes through controller 1.',
      value: 4.9583,
      limit: null,
      unit: 'A',
      reference: 'controller profile',
      suggestion: "Confirm on the controller's datasheet that its input accepts 4.96 A, and add maxInputCurrentA to the profile."
    },
    {
      id: 'driver-loading',
      status: 'pass',
      message: '24 V, one driver per circuit — controller 1: 150 W for 119 W (79.3 %), within 80 %.',
      value: 79.3333,
      limit: 80,
      unit: '%',
      reference: 'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load'
    },
    {
      id: 'selv-voltage',
      status: 'pass',
      message: 'The highest rail is 24 V DC, within SELV and the 60 V limit for exposed live parts.',
      value: 24,
      limit: 60,
      unit: 'V',
      reference: 'IEC 61140 / IEC 60364-4-41: SELV ≤ 120 V ripple-free DC; IEC 60598-1 8.2.3: exposed live parts of Class III luminaires ≤ 60 V ripple-free DC'
    },
    {
      id: 'circuit-protection',
      status: 'pass',
      message: "Every feeder is protected: fuses at the drivers 6.3 A; 1 of 1 feeders also carry their driver's full current limit.",
      value: 10,
      limit: null,
      unit: 'A',
      reference: 'IEC 60364-4-43 433.1: I_B ≤ I_n ≤ I_z (from memory); I_n ≥ 1.25 × I_B as NEC 210.20(A) asks for continuous loads; a fuse opens at about 2.1 × I_n (IEC 60127-2, from memory), so a driver limited below that never blows it and the cable must carry the driver’s limit'
    },
    {
      id: 'cable-drop',
      status: 'pass',
      message: 'Worst drop from a driver to a strip 2.399 % (circuit 1, to controller 1: feeder 2.014 % (1 mm², 2 m) + 0.385 % on the lead to tread 14), within the 5 % end-to-end limit.',
      value: 2.399,
      limit: 5,
      unit: '%',
      reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1); series drop driver → feeder → lead → strip; limit: IEC 60364-7-715 / BS 7671 715.525: ≤ 5 % from the ELV converter (driver) to the farthest luminaire, end to end (from memory); IEC 60364-5-52 Table G.52.1, informative: lighting 3 % public / 6 % private supply'
    },
    {
      id: 'cable-current',
      status: 'pass',
      message: 'Every cable carries its current; the most loaded is the feeder to controller 1: 4.958 A on 1 mm² rated 10 A.',
      value: 4.9583,
      limit: 10,
      unit: 'A',
      reference: 'BS 7671 Appendix 4 Table 4F3A, from memory'
    },
    {
      id: 'cable-run-length',
      status: 'pass',
      message: 'Longest lead from a controller 2.677 m (the lead to tread 14), within 10 m.',
      value: 2.677,
      limit: 10,
      unit: 'm',
      reference: 'common practice, no published source: controller-to-tread runs of 10 m or less'
    },
    {
      id: 'cable-min-size',
      status: 'pass',
      message: 'The thinnest cable chosen is 0.5 mm², not below 0.5 mm².',
      value: 0.5,
      limit: 0.5,
      unit: 'mm²',
      reference: 'common practice, no published source: copper no thinner than 0.5 mm²'
    },
    {
      id: 'sensor-type',
      status: 'pass',
      message: 'PNP sensors on a PNP input.',
      value: 'pnp',
      limit: 'pnp',
      unit: '',
      reference: 'PNP sources, NPN sinks (three-wire DC sensor outputs, IEC 60947-5-2); stair-controller inputs are usually PNP (common practice, no published source)'
    },
    {
      id: 'sensor-current',
      status: 'pass',
      message: 'Each sensor draws 8 mA of the 12 mA an input gives.',
      value: 8,
      limit: 12,
      unit: 'mA',
      reference: 'controller profile'
    },
    {
      id: 'sensor-supply',
      status: 'pass',
      message: "Sensors rated 5 V on the controller's 5 V sensor supply.",
      value: 5,
      limit: 5,
      unit: 'V',
      reference: 'controller profile'
    },
    {
      id: 'piece-fits-reel',
      status: 'pass',
      message: 'Each 850 mm piece comes from one 5000 mm reel without a joint.',
      value: 850,
      limit: 5000,
      unit: 'mm',
      reference: 'common practice, no published source'
    },
    {
      id: 'sensor-inputs',
      status: 'pass',
      message: '2 motion sensors on 2 sensor inputs.',
      value: 2,
      limit: 2,
      unit: 'sensors',
      reference: 'controller profile'
    }
  ],
  cautions: [
    {
      code: 'mains-work',
      message: 'Treadwise sizes the low-voltage side only. Connecting drivers to the mains is work for a licensed electrician, and the local wiring rules (NEC, IEC 60364 or the national rules) and the installer’s judgement take precedence over these figures.'
    },
    {
      code: 'first-power-on',
      message: 'Before the first power-on, check every run for short circuits and every strip and sensor lead for polarity; a reversed sensor lead is a common fault.'
    },
    {
      code: 'driver-heat',
      message: 'Give drivers room to breathe: mount them where air moves and derate them as their datasheets ask when the space runs warm.'
    },
    {
      code: 'one-supply-per-circuit',
      message: 'Each driver feeds only its own circuit: never connect driver outputs in parallel (unless the datasheet allows it), never join the + of two circuits, and fit each feeder’s fuse at its driver as the circuits list gives it.'
    },
    {
      code: 'not-emergency-lighting',
      message: 'Motion-switched stair lights are orientation lighting, not emergency or escape-route lighting (EN 1838 and the building’s emergency lighting design cover that).'
    },
    {
      code: 'nominal-data',
      message: 'Every figure is an estimate from nominal data; confirm currents, cut pitches, feed lengths and cable ratings with the datasheets of the parts actually bought.'
    }
  ],
  standby: {
    controllerW: 0.5,
    sensorsW: 0.13,
    driversW: 0.5,
    pixelIcsW: 0,
    totalW: 1.13,
    litMinutesPerDay: 30,
    litLoadW: 119,
    standbyKWhPerYear: 9.693,
    litKWhPerYear: 21.924,
    totalKWhPerYear: 31.616,
    defaultsUsed: [
      'controllerW',
      'driverNoLoadW',
      'darkPixelMa',
      'daylightSensorW',
      'litMinutesPerDay'
    ]
  },
  trace: [
    {
      quantity: 'default cable.feederLengthM',
      value: 2,
      unit: 'm',
      formula: 'not given; default used',
      inputs: {},
      reference: 'driver mounted beside the controller (Treadwise assumption, no published source)'
    },
    {
      quantity: 'stripLengthMm',
      value: 850,
      unit: 'mm',
      formula: 'floor((treadWidthMm − 2 × endClearanceMm) / cutPitchMm) × cutPitchMm; at least one pitch',
      inputs: {
        treadWidthMm: 900,
        cutPitchMm: 50,
        endClearanceMm: 20,
        endClearanceDefaulted: true,
        fits: true
      },
      reference: 'strip cut only at its marks; end clearance 20 mm by default (common practice, no published source)'
    },
    {
      quantity: 'treadStrips.totalLoadW',
      value: 119,
      unit: 'W',
      formula: 'Σ tread powers (every tread the same width)',
      inputs: {
        treads: 14,
        litTreads: 14,
        treadPowerW: 8.5
      },
      reference: 'arithmetic'
    },
    {
      quantity: 'longestRunM',
      value: 2.677,
      unit: 'm',
      formula: '|k − c| × stepLengthM + serviceAllowanceM',
      inputs: {
        tread: 14,
        controllerTread: 7,
        serviceAllowanceM: 0.5,
        serviceAllowanceDefaulted: true,
        landings: 0,
        practiceLimitM: 10
      },
      reference: 'stair geometry; 10 m practice limit (common practice, no published source)'
    },
    {
      quantity: '24 V rail: requiredRatingW',
      value: 148.75,
      unit: 'W',
      formula: 'P_load / (maxLoadingPercent / 100)',
      inputs: {
        loadW: 119,
        maxLoadingPercent: 80
      },
      reference: 'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load'
    },
    {
      quantity: 'treads.reels',
      value: 3,
      unit: 'reels',
      formula: 'equal pieces: ceil(pieces / floor(usable reel / piece))',
      inputs: {
        pieces: 14,
        reelLengthMm: 5000,
        reelLengthDefaulted: false,
        cutPitchMm: 50,
        usableReelLengthMm: 5000,
        provenOptimal: true
      },
      reference: 'one-dimensional cutting stock without joints; 5 m reel by default (common practice, no published source)'
    },
    {
      quantity: 'worstDropPercent',
      value: 2.014,
      unit: '%',
      formula: 'Vd = 2 · L · I · R′; Vd / V · 100',
      inputs: {
        run: 'the feeder to controller 1',
        lengthM: 2,
        currentA: 4.9583,
        size: '1 mm²',
        resistanceOhmPerKm: 24.375,
        dropV: 0.4834
      },
      reference: 'IEC 60364-5-52 Annex G, two-wire DC loop (cos φ = 1)'
    }
  ]
};

/** Every example by name, for docs and tests. */
export const estimateExamples = {
  alderRowTownhouse,
  alderRowCornerUnit,
  quaysideCorridor,
  harborLaneCheckout,
  alderRowWithRail,
  alderRowTreadPixels,
} as const;
