/**
 * measurement-literature §11, Examples 1–11: CONSTRUCTED coordinates, not patient data. Each
 * expected value is re-derived here by hand arithmetic or with mathjs (support/reference-math,
 * which follows the literature's facing-based formulas rather than the engine's label frame),
 * and compared with the rounded value the literature prints. Where an example gives only the
 * landmarks its measure needs, the remaining corners are invented and said so; they do not
 * enter the checked value.
 */
import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { computeMotionPair } from '../../../shared/measurement/motion-pair'
import { subsidenceFromDiscHeightsMm } from '../../../shared/measurement/subsidence'
import { piLlBandFromMismatchDeg } from '../../../shared/measurement/alignment'
import {
  atan2Deg,
  cobbDeg,
  distance,
  pelvisReference,
  taillardSlip,
  type Xy,
} from '../support/reference-math'

describe('Example 1: simple anterolisthesis facing right', () => {
  // S1 P = (1000, 2000), A = (1300, 2000); L5 posterior-inferior Q = (1030, 1940).
  // L5's other corners are invented above the S1 endplate.
  const doc = {
    points: {
      'S1.ps': [1000, 2000] as Xy,
      'S1.as': [1300, 2000] as Xy,
      'L5.pi': [1030, 1940] as Xy,
      'L5.ai': [1330, 1960] as Xy,
      'L5.ps': [1030, 1760] as Xy,
      'L5.as': [1330, 1790] as Xy,
    },
  }
  it('reads a 10.0 % slip, Meyerding I (Taillard via Butt & Saifuddin 2005 [V])', () => {
    // d = (30, −60)·(1, 0) = 30 px; slip = 100·30/300 = 10 %.
    const expected = (100 * 30) / 300
    expect(taillardSlip([1000, 2000], [1300, 2000], [1030, 1940]).percent).toBeCloseTo(expected, 12)
    const segment = computeMeasurements(doc).segments['L5-S1']!
    expect(segment.slipPercent).toBeCloseTo(expected, 10)
    expect(segment.slipPx).toBeCloseTo(30, 10)
    expect(segment.meyerdingGrade).toBe('I')
  })
  it('leaves mm null without calibration', () => {
    const segment = computeMeasurements(doc).segments['L5-S1']!
    expect(segment.slipMm).toBeNull()
    expect(segment.discHeightMm).toBeNull()
  })
})

describe('Example 2: slips of exactly 25 % and 50 %', () => {
  // L4 over L5 here; P = (1000, 1600), A = (1200, 1600), L = 200. Upper corners invented.
  const docWith = (q: Xy) => ({
    points: {
      'L5.ps': [1000, 1600] as Xy,
      'L5.as': [1200, 1600] as Xy,
      'L4.pi': q,
      'L4.ai': [q[0] + 200, q[1]] as Xy,
      'L4.ps': [q[0], q[1] - 150] as Xy,
      'L4.as': [q[0] + 200, q[1] - 150] as Xy,
    },
  })
  it('grades 25.0 % as I under the upper-inclusive rule (Meyerding 1932 [M]; 0–25 / 26–50 [V-sec])', () => {
    // 2a: Q = (1050, 1540): d = 50, slip = 100·50/200 = 25.0 %.
    const segment = computeMeasurements(docWith([1050, 1540])).segments['L4-L5']!
    expect(segment.slipPercent).toBeCloseTo((100 * 50) / 200, 10)
    expect(segment.meyerdingGrade).toBe('I')
  })
  it('grades 50.0 % as II and not high-grade under "> 50 %" (Kasliwal et al. [V])', () => {
    // 2b: Q = (1100, 1540): d = 100, slip = 50.0 %.
    const segment = computeMeasurements(docWith([1100, 1540])).segments['L4-L5']!
    expect(segment.slipPercent).toBeCloseTo((100 * 100) / 200, 10)
    expect(segment.meyerdingGrade).toBe('II')
    expect(segment.highGrade).toBe(false)
  })
})

describe('Example 3: retrolisthesis', () => {
  // L3 superior P = (1000, 900), A = (1250, 900); L2 posterior-inferior Q = (980, 840).
  const doc = {
    mmPerPixel: 0.1316,
    points: {
      'L3.ps': [1000, 900] as Xy,
      'L3.as': [1250, 900] as Xy,
      'L2.pi': [980, 840] as Xy,
      'L2.ai': [1230, 845] as Xy,
      'L2.ps': [985, 650] as Xy,
      'L2.as': [1235, 660] as Xy,
    },
  }
  it('reads −8.0 %, no Meyerding grade, and −2.6 mm at 0.1316 mm/px', () => {
    // d = (−20, −60)·(1, 0) = −20 px; slip = 100·(−20)/250 = −8 %; −20 × 0.1316 = −2.632 mm.
    const segment = computeMeasurements(doc).segments['L2-L3']!
    expect(segment.slipPercent).toBeCloseTo((100 * -20) / 250, 10)
    expect(segment.slipMm).toBeCloseTo(-20 * 0.1316, 10)
    expect(segment.slipMm).toBeCloseTo(-2.6, 1)
    expect(segment.meyerdingGrade).toBeNull()
    expect(segment.slipDirection).toBe('retrolisthesis')
  })
})

describe('Example 4: spondyloptosis', () => {
  // S1 P = (1000, 1500), A = (1250, 1500); L5 Q = (1275, 1530), anterior to and below S1.
  // L5's other corners are invented so that its centroid stays cranial of the S1 line.
  const doc = {
    points: {
      'S1.ps': [1000, 1500] as Xy,
      'S1.as': [1250, 1500] as Xy,
      'L5.pi': [1275, 1530] as Xy,
      'L5.ai': [1500, 1560] as Xy,
      'L5.ps': [1200, 1330] as Xy,
      'L5.as': [1450, 1330] as Xy,
    },
  }
  it('reads 110.0 %, Meyerding V, high-grade', () => {
    // d = 275, L = 250: slip = 100·275/250 = 110 %.
    const segment = computeMeasurements(doc).segments['L5-S1']!
    expect(segment.slipPercent).toBeCloseTo((100 * 275) / 250, 10)
    expect(segment.meyerdingGrade).toBe('V')
    expect(segment.highGrade).toBe(true)
  })
})

describe('Example 5: lordotic L4–L5 segment, disc heights and calibration', () => {
  const spacing = 25 / 190 // a 25.0 mm sphere measuring 190 px
  const corners = {
    'L4.ps': [1000, 1000] as Xy,
    'L4.as': [1297, 958] as Xy,
    'L4.pi': [1010, 1200] as Xy,
    'L4.ai': [1308, 1169] as Xy,
    'L5.ps': [1012, 1262] as Xy,
    'L5.as': [1311, 1283] as Xy,
    'L5.pi': [1020, 1462] as Xy,
    'L5.ai': [1318, 1498] as Xy,
  }
  const segment = computeMeasurements({ mmPerPixel: spacing, points: corners }).segments['L4-L5']!

  it('reads segmental lordosis 14.94° and disc angle 9.96° (Cobb; IJSS definitions [V])', () => {
    // θ(L4 sup) = atan2(42, 297) = 8.05°, θ(L5 inf) = atan2(−36, 298) = −6.89°.
    const cobb = atan2Deg(42, 297) - atan2Deg(-36, 298)
    // θ(L4 inf) = atan2(31, 298) = 5.94°, θ(L5 sup) = atan2(−21, 299) = −4.02°.
    const disc = atan2Deg(31, 298) - atan2Deg(-21, 299)
    expect(cobb).toBeCloseTo(14.94, 2)
    expect(disc).toBeCloseTo(9.96, 2)
    expect(segment.segmentalLordosisDeg).toBeCloseTo(cobb, 9)
    expect(segment.discAngleDeg).toBeCloseTo(disc, 9)
  })
  it('reads point-to-point disc heights in px and mm (two-point mean: Dabbs 1990 [M])', () => {
    const anterior = Math.sqrt(3 ** 2 + 114 ** 2) // √13005 = 114.04 px
    const posterior = Math.sqrt(2 ** 2 + 62 ** 2) // √3848 = 62.03 px
    const middle = Math.sqrt(2.5 ** 2 + 88 ** 2) // mid (1159, 1184.5) to (1161.5, 1272.5)
    expect(segment.discHeightPx.anterior).toBeCloseTo(anterior, 9)
    expect(segment.discHeightPx.posterior).toBeCloseTo(posterior, 9)
    expect(segment.discHeightPx.middle).toBeCloseTo(middle, 9)
    expect(segment.discHeightPx.mean).toBeCloseTo((anterior + posterior) / 2, 9)
    expect(segment.discHeightMm?.anterior).toBeCloseTo(15.01, 2)
    expect(segment.discHeightMm?.posterior).toBeCloseTo(8.16, 2)
    expect(segment.discHeightMm?.middle).toBeCloseTo(11.58, 2)
    expect(segment.discHeightMm?.mean).toBeCloseTo(((anterior + posterior) / 2) * spacing, 9)
  })
  it('reads the −2.11 % projection artefact as a small retrolisthesis', () => {
    // d = (−2·299 − 62·21)/299.74 = −1900/299.74 = −6.34 px; slip = −2.11 %.
    const slip = taillardSlip([1012, 1262], [1311, 1283], [1010, 1200])
    expect(slip.d).toBeCloseTo(-1900 / Math.sqrt(299 ** 2 + 21 ** 2), 9)
    expect(segment.slipPercent).toBeCloseTo(slip.percent, 9)
    expect(segment.slipPercent).toBeCloseTo(-2.11, 2)
  })
})

describe('Example 6: kyphotic segment facing left', () => {
  // Upper superior P = (2000, 800), A = (1700, 830); lower inferior P = (2010, 1250),
  // A = (1712, 1210), as L2 over L3. The other corners are invented, facing left.
  const doc = {
    points: {
      'L2.ps': [2000, 800] as Xy,
      'L2.as': [1700, 830] as Xy,
      'L2.pi': [2004, 1000] as Xy,
      'L2.ai': [1704, 1012] as Xy,
      'L3.ps': [2006, 1050] as Xy,
      'L3.as': [1708, 1040] as Xy,
      'L3.pi': [2010, 1250] as Xy,
      'L3.ai': [1712, 1210] as Xy,
    },
  }
  it('reads −13.36°, i.e. 13.4° kyphosis, with no facing flag', () => {
    // θ_upper = atan2(−30, 300) = −5.71°, θ_lower = atan2(40, 298) = 7.65° with s_a = −1.
    const expected = cobbDeg(
      [
        [2000, 800],
        [1700, 830],
      ],
      [
        [2010, 1250],
        [1712, 1210],
      ],
      -1,
    )
    expect(expected).toBeCloseTo(atan2Deg(-30, 300) - atan2Deg(40, 298), 12)
    expect(expected).toBeCloseTo(-13.36, 2)
    expect(computeMeasurements(doc).segments['L2-L3']!.segmentalLordosisDeg).toBeCloseTo(
      expected,
      9,
    )
  })
  it('does not fall into the wrong-facing trap that reads +13.36°', () => {
    const wrongFacing = cobbDeg(
      [
        [2000, 800],
        [1700, 830],
      ],
      [
        [2010, 1250],
        [1712, 1210],
      ],
      1,
    )
    expect(wrongFacing).toBeCloseTo(13.36, 2)
    expect(computeMeasurements(doc).segments['L2-L3']!.segmentalLordosisDeg).toBeLessThan(0)
  })
})

describe('Example 7: PI, PT and SS with superimposed femoral heads facing right', () => {
  const ps: Xy = [1000, 1000]
  const as: Xy = [1200, 1150]
  const hip: Xy = [1260, 1775]
  const pelvis = computeMeasurements({ points: { 'S1.ps': ps, 'S1.as': as, FH1: hip } }).pelvis

  it('reads SS 36.87°, PT 12.88°, PI 49.74° (Legaye et al. 1998 [V])', () => {
    // SS = atan2(150, 200); PT = atan2(160, 700); PI = SS + PT.
    const reference = pelvisReference(ps, as, hip, 1)
    expect(reference.ss).toBeCloseTo(atan2Deg(150, 200), 12)
    expect(reference.pt).toBeCloseTo(atan2Deg(160, 700), 12)
    expect(reference.pi).toBeCloseTo(reference.ss + reference.pt, 9)
    expect(pelvis?.sacralSlopeDeg).toBeCloseTo(reference.ss, 9)
    expect(pelvis?.tiltDeg).toBeCloseTo(reference.pt, 9)
    expect(pelvis?.incidenceDeg).toBeCloseTo(reference.pi, 9)
    expect(pelvis?.incidenceDeg).toBeCloseTo(49.74, 1)
  })
  it('reads the Le Huec & Hasegawa target 0.54·PI + 27.6 ≈ 54.47° (Eur Spine J 2016 [V])', () => {
    const expected = 0.54 * (atan2Deg(150, 200) + atan2Deg(160, 700)) + 27.6
    const result = computeMeasurements({ points: { 'S1.ps': ps, 'S1.as': as, FH1: hip } })
    expect(result.targetLordosisDeg).toBeCloseTo(expected, 9)
    expect(result.targetLordosisDeg).toBeCloseTo(54.47, 1)
  })
  it('bands a PI−LL of 4.75° (LL 45°) as SRS-Schwab "0" (Schwab et al. 2012 [V-sec])', () => {
    expect(piLlBandFromMismatchDeg(49.75 - 45)).toBe('0')
  })
})

describe('Example 8: two separated femoral heads facing left', () => {
  const ps: Xy = [2000, 1000]
  const as: Xy = [1780, 1120]
  const fh1: Xy = [1760, 1700]
  const fh2: Xy = [1700, 1740]

  it('uses the midpoint of the heads: SS 28.61°, PT 13.63°, PI 42.24°', () => {
    // H = (1730, 1720); SS = atan2(120, 220); PT = atan2(160, 660).
    const reference = pelvisReference(ps, as, [1730, 1720], -1)
    expect(reference.ss).toBeCloseTo(atan2Deg(120, 220), 12)
    expect(reference.pt).toBeCloseTo(atan2Deg(160, 660), 12)
    const pelvis = computeMeasurements({
      points: { 'S1.ps': ps, 'S1.as': as, FH1: fh1, FH2: fh2 },
    }).pelvis
    expect(pelvis?.sacralSlopeDeg).toBeCloseTo(reference.ss, 9)
    expect(pelvis?.tiltDeg).toBeCloseTo(reference.pt, 9)
    expect(pelvis?.incidenceDeg).toBeCloseTo(reference.pi, 9)
    expect(pelvis?.incidenceDeg).toBeCloseTo(42.24, 2)
  })
  it('shifts PT by about ±2° with one head only', () => {
    // FH1: PT = atan2(130, 640) = 11.48°; FH2: PT = atan2(190, 680) = 15.61°.
    const one = computeMeasurements({ points: { 'S1.ps': ps, 'S1.as': as, FH1: fh1 } }).pelvis
    const two = computeMeasurements({ points: { 'S1.ps': ps, 'S1.as': as, FH2: fh2 } }).pelvis
    expect(one?.tiltDeg).toBeCloseTo(atan2Deg(130, 640), 9)
    expect(two?.tiltDeg).toBeCloseTo(atan2Deg(190, 680), 9)
    expect(one?.incidenceDeg).toBeCloseTo(40.09, 2)
    expect(two?.incidenceDeg).toBeCloseTo(44.22, 2)
  })
  it('never produces the impossible wrong-orientation reading SS 151.39°', () => {
    const wrong = pelvisReference(ps, as, [1730, 1720], 1)
    expect(wrong.ss).toBeCloseTo(151.39, 2)
    const pelvis = computeMeasurements({
      points: { 'S1.ps': ps, 'S1.as': as, FH1: fh1, FH2: fh2 },
    }).pelvis
    expect(pelvis?.sacralSlopeDeg).toBeLessThan(90)
    expect(pelvis?.tiltDeg).toBeGreaterThan(0)
  })
})

describe('Example 9: tilted S1 endplate, where the naive Δx method is wrong', () => {
  // S1 P = (800, 1500), A = (1040, 1570); L5 Q = (903, 1504). L5's other corners invented.
  const doc = {
    points: {
      'S1.ps': [800, 1500] as Xy,
      'S1.as': [1040, 1570] as Xy,
      'L5.pi': [903, 1504] as Xy,
      'L5.ai': [1140, 1540] as Xy,
      'L5.ps': [930, 1320] as Xy,
      'L5.as': [1170, 1370] as Xy,
    },
  }
  it('reads 40.0 %, Meyerding II, by projecting on the endplate; SS 16.26°', () => {
    // e = (240, 70)/250 = (0.96, 0.28); d = (103, 4)·e = 98.88 + 1.12 = 100 px; 100/250 = 40 %.
    const d = 103 * 0.96 + 4 * 0.28
    const result = computeMeasurements(doc)
    expect(result.segments['L5-S1']!.slipPercent).toBeCloseTo((100 * d) / 250, 9)
    expect(result.segments['L5-S1']!.meyerdingGrade).toBe('II')
    expect(result.pelvis?.sacralSlopeDeg).toBeCloseTo(atan2Deg(70, 240), 9)
    // The naive readings 103/240 = 42.9 % and 103/250 = 41.2 % are not what is reported.
    expect(result.segments['L5-S1']!.slipPercent).not.toBeCloseTo((100 * 103) / 240, 1)
  })
})

describe('Example 10: flexion/extension translation and ROM at L4–L5', () => {
  const spacing = 25 / 187.5 // 0.13333 mm/px
  // L5 superior endplate identical on both films; L5 inferior and L4 corners per film. L4's
  // anterior-inferior corner is invented (it does not enter slip, ROM or translation).
  const film = (l4Ps: Xy, l4As: Xy, q: Xy, l5Ai: Xy) => ({
    mmPerPixel: spacing,
    points: {
      'L4.ps': l4Ps,
      'L4.as': l4As,
      'L4.pi': q,
      'L4.ai': [q[0] + 290, q[1] - 10] as Xy,
      'L5.ps': [1000, 1500] as Xy,
      'L5.as': [1270, 1500] as Xy,
      'L5.pi': [1000, 1700] as Xy,
      'L5.ai': l5Ai,
    },
  })
  const extension = film([1000, 1100], [1295, 1048], [1007.5, 1440], [1297, 1742])
  const flexion = film([1030, 1120], [1330, 1130], [1039, 1445], [1298, 1731])

  it('reads translation 4.2 mm = 11.7 % and ROM 14.02°', () => {
    // d_ext = 7.5 px = 1.0 mm, d_flex = 39 px = 5.2 mm; ΔT = 31.5 px·0.13333 = 4.2 mm;
    // 31.5/270 = 11.67 % of the 36.0 mm endplate.
    const extAngle = atan2Deg(1100 - 1048, 295) - atan2Deg(1700 - 1742, 297) // 18.05°
    const flexAngle = atan2Deg(1120 - 1130, 300) - atan2Deg(1700 - 1731, 298) // 4.03°
    const motion = computeMotionPair(flexion, extension).segments['L4-L5']!
    expect(motion.translationMm).toBeCloseTo((39 - 7.5) * spacing, 9)
    expect(motion.translationMm).toBeCloseTo(4.2, 6)
    expect(motion.translationPercent).toBeCloseTo((100 * (39 - 7.5)) / 270, 9)
    expect(motion.rangeOfMotionDeg).toBeCloseTo(extAngle - flexAngle, 9)
    expect(motion.rangeOfMotionDeg).toBeCloseTo(14.02, 2)
  })
  it('reports which criteria flag: White & Panjabi no, Dupuis yes, IDE 5 mm no', () => {
    const criteria = computeMotionPair(flexion, extension).segments['L4-L5']!.criteria
    const byId = Object.fromEntries(criteria.map((criterion) => [criterion.id, criterion]))
    // White & Panjabi 1990 [M]: 4.2 ≤ 4.5 mm, 11.7 ≤ 15 %, 14.02 ≤ 20° at L4–L5.
    expect(byId['white-panjabi-1990']?.flagged).toBe(false)
    // Dupuis et al. 1985 [M for the numbers]: 4.2 > 4 mm.
    expect(byId['dupuis-1985']?.translationFlagged).toBe(true)
    expect(byId['ide-translation-5mm']?.flagged).toBe(false)
  })
})

describe('Example 10b: subsidence depends on the definition', () => {
  // 6-week ADH/PDH = 14.0/9.0 mm (mean 11.5); one year 11.2/8.6 mm (mean 9.9).
  const baseline = { anterior: 14, middle: null, posterior: 9, mean: 11.5 }
  const current = { anterior: 11.2, middle: null, posterior: 8.6, mean: 9.9 }
  it('flags a 2.8 mm anterior loss at the 2 mm default but not the 1.6 mm mean loss (Rao et al. 2017 [V])', () => {
    const result = subsidenceFromDiscHeightsMm(baseline, current)
    expect(result.lossMm.anterior).toBeCloseTo(14 - 11.2, 9)
    expect(result.lossMm.mean).toBeCloseTo(11.5 - 9.9, 9)
    expect(result.anteriorFlagged).toBe(true)
    expect(result.meanFlagged).toBe(false)
    expect(result.subsided).toBe(true)
  })
  it('does not flag it under a 3 mm site threshold', () => {
    expect(subsidenceFromDiscHeightsMm(baseline, current, 3).subsided).toBe(false)
  })
})

describe('Example 11: disc replacement sagittal position', () => {
  // L5 superior P = (1000, 1500), A = (1300, 1500); implant centre C = (1135, 1470).
  // L4's corners are invented above.
  const spacing = 25 / 187.5
  const doc = {
    mmPerPixel: spacing,
    points: {
      'L5.ps': [1000, 1500] as Xy,
      'L5.as': [1300, 1500] as Xy,
      'L4.pi': [1000, 1440] as Xy,
      'L4.ai': [1300, 1420] as Xy,
      'L4.ps': [1000, 1240] as Xy,
      'L4.as': [1300, 1230] as Xy,
      'implant.L4-L5.marker': [1135, 1470] as Xy,
    },
  }
  it('reads 45 % of the depth from the posterior edge and −2.0 mm from the midpoint [D]', () => {
    // r = 135/300 = 0.45; offset = (0.45 − 0.5) × 300 px × 0.13333 mm/px = −2.0 mm.
    const segment = computeMeasurements(doc).segments['L4-L5']!
    expect(segment.implantPositionPercent).toBeCloseTo((100 * 135) / 300, 9)
    expect(segment.implantOffsetMm).toBeCloseTo(
      (135 / 300 - 0.5) * distance([1000, 1500], [1300, 1500]) * spacing,
      9,
    )
    expect(segment.implantOffsetMm).toBeCloseTo(-2, 9)
  })
})
