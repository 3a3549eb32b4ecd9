/**
 * Builds the report's plain data (./data) from the pipeline's result. The only file of the report that
 * knows the pipeline's shapes: when they move, this adapts and the figures and document stay as they are.
 */
import { isOnsetPick, methodInfo, isIntervalMethod, profileMethodFor } from '../catalogue/methods';
import { hasDirectVelocities, kindInfo, receiverCountOf, receiverLabel } from '../catalogue/testKinds';
import { isReceiverSlot, stationWaveKey } from '../keys';
import type { Survey } from '../model';
import type { Derived, Prepared } from '../pipeline';
import type { Settings, UserEdits } from '../settings';
import { STANDARD_NAMES } from '../site/classes';
import { toDisplay, unitSpec, type UnitSystem } from '../units';
import type { ReportData, ReportInterval, ReportPickOrigin, ReportSetting, ReportWave } from './data';
import { EXPORT_CAUTIONS } from './tables';

/** Shown beside field damping wherever the report gives it. */
export const FIELD_D_CAUTION =
  'Field attenuation includes scattering and geometric effects that are not removed, so field D is an upper bound on material damping.';

/** Test kind in words with the standard it follows (the catalogue's name). */
export function testKindWords(survey: Survey): string {
  const info = kindInfo(survey.kind);
  return `${info.label} (${info.sourceInHole ? 'ASTM D4428/D4428M' : 'ASTM D7400'})`;
}

/** A method in words, from the method catalogue. */
export function methodWords(id: string): string {
  return isIntervalMethod(id) ? methodInfo(id).label : id;
}

/** A receiver slot as the user names it ("upper", "near B2"); other text as it is. */
function receiverWords(survey: Survey, receiver: string): string {
  return isReceiverSlot(receiver) ? receiverLabel(survey, receiver) : receiver;
}

export interface ReportInputs {
  survey: Survey;
  settings: Settings;
  edits: UserEdits;
  prepared: Prepared;
  derived: Derived;
  units: UnitSystem;
  softwareVersion: string;
  /** ISO 8601; the caller's clock (kept out of the core). */
  madeAt: string;
}

/** Set-up problems that block Vs30 and the class, where the result carries them (site or top level). */
export function setupProblemsOf(derived: Derived): string[] {
  const found: unknown[] = [];
  for (const holder of [derived.site as object, derived as object]) {
    if ('setupProblems' in holder) {
      const v = (holder as { setupProblems: unknown }).setupProblems;
      if (Array.isArray(v)) found.push(...v);
    }
  }
  return found
    .map((p) =>
      typeof p === 'string'
        ? p
        : p && typeof p === 'object' && 'message' in p
          ? String((p as { message: unknown }).message) +
            ('fix' in p && (p as { fix: unknown }).fix ? ` Fix: ${String((p as { fix: unknown }).fix)}` : '')
          : '',
    )
    .filter(Boolean);
}

function optionalText(o: object, key: string): string | null {
  if (!(key in o)) return null;
  const v = (o as Record<string, unknown>)[key];
  return typeof v === 'string' && v.trim() ? v.trim() : null;
}

function holesOf(survey: Survey): string[] {
  return hasDirectVelocities(survey.kind)
    ? [survey.mainHoleId, ...survey.receiverHoleIds].filter(Boolean)
    : [survey.mainHoleId].filter(Boolean);
}

function settingsRows(survey: Survey, s: Settings, units: UnitSystem): ReportSetting[] {
  // Settings are shown as entered (not rounded to the reporting digits), free of conversion noise.
  const plain = (x: number) => String(Number(x.toPrecision(6)));
  const dist = (m: number) => `${plain(toDisplay('depth', units, m))} ${unitSpec('depth', units).label}`;
  const vel = (v: number) => `${plain(toDisplay('velocity', units, v))} ${unitSpec('velocity', units).label}`;
  const band = (b: Settings['conditioning']['bandpassS']) =>
    b ? `${b.lowHz}–${b.highHz} Hz, order ${b.order}` : 'none';
  const rows: ReportSetting[] = [
    { label: 'Profile method', value: methodWords(profileMethodFor(s.intervals.profileMethod, survey.kind)) },
    { label: 'Onset picker', value: s.picking.onsetMethod === 'aic' ? 'AIC (Maeda 1985)' : 'STA/LTA (Allen 1978)' },
    {
      label: 'Reversed hits',
      value: s.conditioning.useReversedHits ? 'S from their difference, P from their sum' : 'not used',
    },
    { label: 'Band-pass S / P', value: `${band(s.conditioning.bandpassS)} / ${band(s.conditioning.bandpassP)}` },
    { label: 'Plausible Vs range', value: `${vel(s.picking.vsRangeMps[0])} – ${vel(s.picking.vsRangeMps[1])}` },
    { label: 'Plausible Vp range', value: `${vel(s.picking.vpRangeMps[0])} – ${vel(s.picking.vpRangeMps[1])}` },
    {
      label: '“Methods differ” when other methods differ by more than',
      value: `${plain(s.intervals.methodDisagreementShare * 100)} %`,
    },
    { label: 'Position uncertainty (each end)', value: dist(s.intervals.positionSdM) },
  ];
  if (hasDirectVelocities(survey.kind))
    rows.push({ label: 'Trigger delay t0', value: `${plain(s.intervals.triggerDelayS * 1000)} ms` });
  else {
    rows.push({
      label: 'Source offset / depth',
      value: `${dist(survey.sourceOffsetM)} / ${dist(survey.sourceDepthM)}`,
    });
    if (receiverCountOf(survey) === 2) rows.push({ label: 'Receiver spacing', value: dist(survey.receiverSpacingM) });
    if (kindInfo(survey.kind).tipLogged)
      rows.push({ label: 'Receiver above the cone tip', value: dist(survey.coneOffsetM) });
    rows.push({ label: 'Refracted-ray layer fit', value: s.intervals.rayFit ? 'on' : 'off' });
  }
  rows.push({
    label: 'Layer boundaries',
    value:
      s.layering.mode === 'user' && s.layering.boundariesM.length
        ? s.layering.boundariesM.map(dist).join(', ')
        : 'from the soil column',
  });
  rows.push({
    label: 'Water table',
    value: survey.soil.waterTableM === null ? 'none given' : dist(survey.soil.waterTableM),
  });
  rows.push({
    label: 'Vs30 when the profile is shorter than 30 m',
    value:
      s.site.vs30Rule === 'extend-deepest' ? 'deepest velocity extended to 30 m' : 'averaged over the measured depth',
  });
  rows.push({ label: 'Monte Carlo draws / seed', value: `${s.site.monteCarloDraws} / ${s.site.monteCarloSeed}` });
  const yes = Object.entries(s.site.siteAnswers)
    .filter(([, v]) => v)
    .map(([k]) => k);
  rows.push({ label: 'Site questions answered yes', value: yes.length ? yes.join(', ') : 'none' });
  rows.push({
    label: 'Hand edits',
    value: '',
  });
  return rows;
}

function intervalRows(derived: Derived, settings: Settings): ReportInterval[] {
  const byKey = new Map<string, Derived['intervals']>();
  for (const r of derived.intervals) byKey.set(r.key, [...(byKey.get(r.key) ?? []), r]);
  const out: ReportInterval[] = [];
  for (const rows of byKey.values()) {
    const chosen = rows.find((r) => r.chosen);
    const used = chosen ?? rows.find((r) => r.method === settings.intervals.profileMethod) ?? rows[0];
    const others = rows
      .filter((r) => r !== used && r.velocityMps !== null && Number.isFinite(r.velocityMps))
      .map((r) => r.velocityMps as number);
    out.push({
      wave: used.wave,
      topM: used.topM,
      bottomM: used.bottomM,
      method: methodWords(used.method),
      dtS: used.dtS,
      velocityMps: used.velocityMps,
      velocitySdMps: used.velocitySdMps,
      range95Mps: used.low95Mps !== null && used.high95Mps !== null ? [used.low95Mps, used.high95Mps] : null,
      otherMethodsMps: others.length ? [Math.min(...others), Math.max(...others)] : null,
      flags: chosen ? [...used.flags] : [...used.flags, 'left out of the profile'],
    });
  }
  return out.sort(
    (a, b) => (a.wave === b.wave ? 0 : a.wave === 'S' ? -1 : 1) || a.topM - b.topM || a.bottomM - b.bottomM,
  );
}

export function reportDataFrom(inp: ReportInputs): ReportData {
  const { survey, settings, edits, prepared, derived, units } = inp;
  const excluded = new Set(edits.excludedStations);
  const onset = new Map<string, { timeS: number; origin: ReportPickOrigin }>();
  for (const p of derived.picks)
    if (isOnsetPick(p) && Number.isFinite(p.timeS))
      onset.set(stationWaveKey(p.stationKey, p.wave), { timeS: p.timeS, origin: p.origin });
  const traces = prepared.stations.map((s) => {
    const k = stationWaveKey(s.key, s.wave);
    return {
      depthM: s.depthM,
      wave: s.wave as ReportWave,
      receiver: receiverWords(survey, s.receiver),
      samples: s.working.samples,
      sampleIntervalS: s.working.sampleIntervalS,
      delayS: s.working.delayS,
      pick: onset.get(k) ?? null,
      excluded: excluded.has(k),
    };
  });
  const travel = derived.travelTimes
    .filter((r) => r.times.onset)
    .map((r) => ({
      depthM: r.depthM,
      pathM: r.pathM,
      wave: r.wave as ReportWave,
      receiver: receiverWords(survey, r.receiver),
      timeS: r.times.onset!.timeS,
      origin: r.times.onset!.origin,
    }));
  const layerFits: ReportData['layerFits'] = derived.layerFits.map((f) => ({
    wave: f.wave,
    topM: f.topM,
    bottomM: f.bottomM,
    method: `straight-line fit (${methodWords(f.method)})`,
    velocityMps: f.velocityMps,
    velocitySdMps: f.velocitySdMps,
    interceptS: f.interceptS,
    stations: f.stations,
    rmsMisfitS: f.rmsResidualS,
    flags: f.velocitySdMps === null ? ['two stations: no sd'] : [],
  }));
  if (derived.layerModel)
    for (const l of derived.layerModel.layers)
      layerFits.push({
        wave: 'S',
        topM: l.topM,
        bottomM: l.bottomM,
        method: 'refracted-ray fit (onset)',
        velocityMps: l.velocityMps,
        velocitySdMps: l.velocitySdMps,
        interceptS: null,
        stations: l.receivers,
        rmsMisfitS: derived.layerModel.rmsMisfitS,
        flags: derived.layerModel.converged ? [] : ['not converged'],
      });
  const v = derived.site.vs30;
  const u = derived.site.uncertainty;
  const setupProblems = setupProblemsOf(derived);
  const settingRows = settingsRows(survey, settings, units);
  const edited = Object.keys(edits.picks).length;
  settingRows[settingRows.length - 1].value =
    `${edited} pick${edited === 1 ? '' : 's'} set by hand, ${edits.excludedStations.length} station${edits.excludedStations.length === 1 ? '' : 's'} excluded, ` +
    `${Object.keys(edits.chosenMethod).length} interval method${Object.keys(edits.chosenMethod).length === 1 ? '' : 's'} chosen, ${edits.excludedIntervals.length} interval${edits.excludedIntervals.length === 1 ? '' : 's'} left out`;
  return {
    title: {
      project: survey.name,
      site: optionalText(survey, 'siteName'),
      holes: holesOf(survey),
      testKind: testKindWords(survey),
      testDate: optionalText(survey, 'testDate'),
      units,
      softwareVersion: inp.softwareVersion,
      madeAt: inp.madeAt,
    },
    settings: settingRows,
    traces,
    travel,
    layerFits,
    intervals: intervalRows(derived, settings),
    profile: derived.profile.map((r) => ({
      topM: r.topM,
      bottomM: r.bottomM,
      vsMps: r.vsMps,
      vsSdMps: r.vsSdMps,
      vsRange95Mps: r.vsLow95Mps !== null && r.vsHigh95Mps !== null ? [r.vsLow95Mps, r.vsHigh95Mps] : null,
      vpMps: r.vpMps,
      vpSdMps: r.vpSdMps,
      gmaxKpa: r.gmaxKpa,
      gmaxSdKpa: r.gmaxSdKpa,
      vs1Mps: r.vs1Mps,
      sigmaVEffKpa: r.sigmaVEffKpa,
      densityMgM3: r.densityMgM3,
      poissonRatio: r.poissonRatio,
      method: methodWords(r.method),
      flags: [...r.flags],
    })),
    waterTableM: survey.soil.waterTableM,
    site: {
      setupProblems,
      vs30Mps: setupProblems.length ? null : (v?.vsMps ?? null),
      toDepthM: v?.toDepthM ?? null,
      profileDepthM: v?.profileDepthM ?? null,
      extended: v?.extended ?? false,
      flags: v?.flags ?? [],
      spread:
        u && !setupProblems.length
          ? { p05Mps: u.vs30P05Mps, p50Mps: u.vs30P50Mps, p95Mps: u.vs30P95Mps, draws: settings.site.monteCarloDraws }
          : null,
      classes: setupProblems.length
        ? []
        : derived.site.classes.map((k) => ({
            standard: STANDARD_NAMES[k.standard] ?? k.standard,
            siteClass: k.siteClass,
            probabilities: Object.entries(u?.classProbabilities[k.standard] ?? {}).sort((a, b) => b[1] - a[1]),
            basis: k.basis,
          })),
    },
    fieldDamping: {
      rows: derived.design.layers.flatMap((l) =>
        l.field
          ? [
              {
                topM: l.topM,
                bottomM: l.bottomM,
                layer: l.name,
                fieldDPct: l.field.dampingPct,
                fieldDSdPct: l.field.dampingSdPct,
                frequencyHz: l.field.frequencyHz,
                labDminPct: l.field.labDminPct,
              },
            ]
          : [],
      ),
      reason: derived.damping.reason,
      caution: FIELD_D_CAUTION,
    },
    notes: [...new Set(derived.issues.map((i) => `${i.file ? `${i.file}: ` : ''}${i.message}`))].slice(0, 60),
    cautions: [...EXPORT_CAUTIONS],
  };
}
