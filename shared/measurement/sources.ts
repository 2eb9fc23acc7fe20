/**
 * Citations shown beside each measure and flag, as fixed in measurement-reference. Tags: [V]
 * checked in the published source, [V-sec] through a secondary source, [M] from memory (verify
 * before relying on it), [D] derived geometry; "common practice" has no source.
 */
export const SOURCES = {
  slip: 'Taillard, as described by Butt & Saifuddin 2005, Clin Radiol 60:533 [V]',
  meyerding:
    'Meyerding 1932, Surg Gynecol Obstet 54:371 [M]; endplate quarters via Butt & Saifuddin 2005 [V]; upper-inclusive boundaries follow the 0–25/26–50 % ranges [V-sec]',
  highGrade: 'Kasliwal et al., Management of high-grade spondylolisthesis, Neurosurg Clin N Am [V]',
  segmentalLordosis:
    'Cobb method; index-level definition in the interbody-fusion definitions table of Int J Spine Surg [V]',
  discHeight:
    'point-to-point heights; two-point mean: Dabbs & Dabbs 1990, Spine 15:1366 [M], compared in Spahn et al. 2024, Z Orthop Unfall 162:254 [V]',
  slipAngle:
    'Boxall et al. 1979, J Bone Joint Surg Am 61:479 [M]; values in Hanson 2002 via review [V-sec]',
  lumbarLordosis: 'Polly et al. 1996, Spine 21:1530 [V]',
  distalLordosis: 'Yukawa et al. 2019, Asian Spine J 13:663 [V]',
  pelvis: 'Legaye, Duval-Beaupère, Hecquet, Marty 1998, Eur Spine J 7:99 [V]',
  piLlBand: 'Schwab et al. 2012, Spine 37:1077 [V-sec]',
  targetLordosis: 'Le Huec & Hasegawa 2016, Eur Spine J 25:3630 [V]',
  whitePanjabi: 'White & Panjabi 1990, Clinical Biomechanics of the Spine, 2nd ed. [M]',
  dupuis: 'Dupuis et al. 1985, Spine 10:262 [V for the paper; M for the thresholds]',
  ideTranslation:
    'US IDE lumbar disc replacement trial exclusion: > 5 mm sagittal translation (IJSS IDE table; Büttner-Janz et al. 2014, Int J Spine Surg 8:12) [V]',
  subsidence:
    'Rao et al. 2017, J Spine Surg; interbody-fusion definitions table of Int J Spine Surg [V]; the threshold is a site setting',
  implantPosition:
    'percent of endplate depth from its posterior edge [D]; a slightly posterior target is common practice',
  cageLordosis: 'difference of the cage surface angles in the segment frame [D]',
  parsDefect:
    'Huang et al. 2004, Spine 29:2538; Büttner-Janz et al. 2014, Int J Spine Surg 8:12 [V]',
  slipGrade:
    'IDE trial criteria: grade II or more degenerative spondylolisthesis excluded (Huang et al. 2004; Büttner-Janz et al. 2014) [V]',
  facetDegeneration:
    'Huang et al. 2004, Spine 29:2538; Büttner-Janz et al. 2014, Int J Spine Surg 8:12 [V]',
  osteoporosis: 'Büttner-Janz et al. 2014, Int J Spine Surg 8:12 [V]',
  residualDiscHeight:
    'Büttner-Janz et al. 2014, Int J Spine Surg 8:12 [V]: the literature is mixed on a minimum disc height',
  frontalOffset:
    'offset of the implant centre from the body midline along the endplates [D]; flagged above 3 mm by default (a site setting): McAfee et al. 2005, Spine 30:1576, ideal placement within 3 mm of the midline [M]',
  frontalTilt: 'angle between the implant and the mean endplate direction [D]',
  frontalSegmentAngle: 'angle between the upper and lower endplate lines on the frontal film [D]',
  frontalRotation:
    'spinous process tip off the body midline, % of half the endplate width; a large value means a rotated film (common practice)',
  plannedLordosis:
    'current lordosis + Σ(planned implant angle − current segmental angle at fused segments) [D]: an estimate',
} as const
