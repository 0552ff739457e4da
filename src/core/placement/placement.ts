/** Where each load is corrected: at its terminals, at its group (MCC/feeder) bank, centrally, or not at all. */
import { tanPhi } from "../conventions.js";
import { capacitorCurrentA, kvarAtVoltage } from "../bank/capacitor.js";
import { CONDUCTOR_AMPACITY_FACTOR, terminalCapacitorConductorMinA } from "../bank/protection.js";
import { STANDARD_UNIT_KVAR } from "../bank/standard-sizes.js";
import { mergeBySubject, warning, type Warning } from "../warnings.js";
import { largestSizeAtMost, motorLineCurrentA, SELF_EXCITATION_SOURCE, selfExcitationLimitKvar, terminalSafety } from "./rules.js";
import type { LoadPlacement, LocationKvar, PlacementInput, PlacementLoad, PlacementLocation, PlacementPlan } from "./placement-types.js";

export type * from "./placement-types.js";

export const DEFAULT_SELF_EXCITATION_SHARE = 0.9;
export const DEFAULT_TERMINAL_MIN_KW = 20;
export const DEFAULT_GROUP_MIN_KVAR = 50;
const EPS = 1e-6;

/** Place correction per load: terminal where safe, large and continuous; group banks where big enough; central for the rest. */
export function planPlacement(input: PlacementInput): PlacementPlan {
  const o = input.options ?? {};
  const share = o.selfExcitationShare ?? DEFAULT_SELF_EXCITATION_SHARE;
  const minKW = o.terminalMinKW ?? DEFAULT_TERMINAL_MIN_KW;
  const groupMin = o.groupMinKvar ?? DEFAULT_GROUP_MIN_KVAR;
  const sizes = o.unitSizesKvar ?? STANDARD_UNIT_KVAR;
  const prefix = input.pathPrefix ?? "loads";
  const tanT = tanPhi(input.targetPF);
  const required = Math.max(0, input.siteRequiredKvar);
  const warnings: Warning[] = [];
  const notes: string[] = [];

  const out: LoadPlacement[] = input.loads.map((l, index) => ({
    index,
    label: l.label,
    location: "none",
    reason: "",
    needKvar: l.kvar - l.kW * tanT,
  }));

  // 1. Terminal candidates, largest motors first, while the site still needs the kvar.
  type Offer = { i: number; perMotorKvar: number; nameplateKvar: number; ratedVoltageV: number; limitKvar: number; q: number; unitKW: number };
  const offers: Offer[] = [];
  input.loads.forEach((l, i) => {
    const p = out[i] as LoadPlacement;
    const q = l.quantity ?? 1;
    const unitKW = l.kW / q;
    const safety = terminalSafety(l);
    const about = { subjects: [l.label] };
    if (safety.code) warnings.push(warning(safety.code, `${l.label}: ${safety.reason}`, `${prefix}.${i}`, about));
    if (!safety.safe && l.kind === "motor" && l.starting === undefined && unitKW >= minKW) {
      warnings.push(
        warning(
          "starting_method_needed",
          `${l.label}: state how the motor is started (starting) to know whether a terminal capacitor is safe`,
          `${prefix}.${i}.starting`,
          about,
        ),
      );
    }
    if (!safety.safe) return void (p.reason = safety.reason);
    if (unitKW < minKW)
      return void (p.reason = `${unitKW.toFixed(1)} kW per motor is below the ${minKW} kW worth a terminal capacitor (common practice)`);
    if (l.continuousDuty === false) return void (p.reason = "runs intermittently: a terminal capacitor would idle; corrected upstream");
    if (l.noLoadAmps === undefined) {
      const msg = `${l.label}: to size a terminal capacitor, measure the motor's no-load current uncoupled from its load at rated voltage (or take it from the maker's data) and give noLoadAmps`;
      warnings.push(warning("no_load_current_needed", msg, `${prefix}.${i}.noLoadAmps`, about));
      return void (p.reason = `no-load current not given, so the self-excitation limit is unknown (${SELF_EXCITATION_SOURCE})`);
    }
    // Q_max at the voltage the motor runs at (the reading's volts when given); units are standard sizes at their
    // nameplate voltage and deliver Q_r·(V/V_r)² there (IEEE Std 18 rating basis, capacitor.ts).
    const limitKvar = selfExcitationLimitKvar(l.noLoadAmps, l.voltageV, l.phases);
    const ratedVoltageV = input.unitRatedVoltageV ?? l.voltageV;
    const perNameplate = kvarAtVoltage(1, l.voltageV, ratedVoltageV);
    const needPerMotor = p.needKvar / q;
    const unit = largestSizeAtMost(Math.min(share * limitKvar, needPerMotor), sizes, perNameplate);
    if (unit === null) {
      p.reason = `${(share * 100).toFixed(0)} % of the ${limitKvar.toFixed(1)} kvar self-excitation limit, or the ${Math.max(0, needPerMotor).toFixed(1)} kvar it needs, is below the smallest unit`;
      return;
    }
    offers.push({ i, perMotorKvar: unit * perNameplate, nameplateKvar: unit, ratedVoltageV, limitKvar, q, unitKW });
  });
  offers.sort((a, b) => b.unitKW - a.unitKW || a.i - b.i);

  let terminalKvar = 0;
  const residual = out.map((p) => p.needKvar);
  for (const f of offers) {
    const l = input.loads[f.i] as PlacementLoad;
    const p = out[f.i] as LoadPlacement;
    const total = f.perMotorKvar * f.q;
    if (terminalKvar + total > required + EPS) {
      p.reason = `the site needs ${required.toFixed(1)} kvar in all and terminal capacitors on larger motors already supply ${terminalKvar.toFixed(1)} kvar`;
      continue;
    }
    terminalKvar += total;
    residual[f.i] = p.needKvar - total;
    const before = motorLineCurrentA(l.kW / f.q, l.kvar / f.q, 0, l.voltageV, l.phases);
    const after = motorLineCurrentA(l.kW / f.q, l.kvar / f.q, f.perMotorKvar, l.voltageV, l.phases);
    const ratedA = capacitorCurrentA(f.nameplateKvar, f.ratedVoltageV, l.phases);
    const conductorMinA = terminalCapacitorConductorMinA(ratedA, l.motorConductorAmpacityA);
    const unitText =
      Math.abs(f.perMotorKvar - f.nameplateKvar) < 1e-9
        ? `one ${f.nameplateKvar} kvar ${f.ratedVoltageV} V unit per motor`
        : `one ${f.nameplateKvar} kvar ${f.ratedVoltageV} V unit per motor (${f.perMotorKvar.toFixed(2)} kvar at ${l.voltageV} V)`;
    p.location = "terminal";
    p.reason = `large (${f.unitKW.toFixed(1)} kW), continuous and safely started: ${unitText}, within ${(share * 100).toFixed(0)} % of its ${f.limitKvar.toFixed(1)} kvar self-excitation limit at ${l.voltageV} V (${SELF_EXCITATION_SOURCE}); capacitor conductors at least ${conductorMinA.toFixed(1)} A (NFPA 70 460.8(A))`;
    p.terminal = {
      perMotorKvar: f.perMotorKvar,
      perMotorNameplateKvar: f.nameplateKvar,
      ratedVoltageV: f.ratedVoltageV,
      voltageV: l.voltageV,
      totalKvar: total,
      selfExcitationLimitKvar: f.limitKvar,
      lineCurrentBeforeA: before,
      lineCurrentAfterA: after,
      overloadNote: `line current at the measured load (${l.voltageV} V) falls from ${before.toFixed(1)} A to ${after.toFixed(1)} A (× ${(after / before).toFixed(3)}): base the overload relay setting on the corrected current, not the nameplate full-load current (NFPA 70 460.9)`,
      capacitorRatedCurrentA: ratedA,
      conductorMinAmpacityA: conductorMinA,
      conductorNote: conductorNoteText(ratedA, l.motorConductorAmpacityA),
    };
  }

  // 2. Group banks, the largest net need first, capped by what the site still needs.
  const groups = new Map<string, number[]>();
  input.loads.forEach((l, i) => {
    if (l.group !== undefined) groups.set(l.group, [...(groups.get(l.group) ?? []), i]);
  });
  const groupNeeds = [...groups.entries()]
    .map(([name, idx]) => ({ name, idx, need: idx.reduce((s, i) => s + (residual[i] as number), 0) }))
    .sort((a, b) => b.need - a.need || a.name.localeCompare(b.name));
  const locations: LocationKvar[] = [];
  const banked = new Set<string>();
  let groupKvar = 0;
  for (const g of groupNeeds) {
    const kvar = Math.min(g.need, required - terminalKvar - groupKvar);
    if (kvar < groupMin - EPS) {
      notes.push(
        `group ${g.name}: net ${g.need.toFixed(1)} kvar still needed${kvar < g.need - EPS ? `, ${Math.max(0, kvar).toFixed(1)} kvar of it left after the banks before it` : ""}, below the ${groupMin} kvar worth a group bank (common practice): corrected centrally`,
      );
      continue;
    }
    banked.add(g.name);
    groupKvar += kvar;
    const loc: PlacementLocation = `group:${g.name}`;
    locations.push({ location: loc, kvar, loads: g.idx.filter((i) => (residual[i] as number) > EPS).map((i) => input.loads[i]?.label ?? "") });
    if (kvar < g.need - EPS)
      notes.push(
        `group ${g.name}: bank capped at ${kvar.toFixed(1)} kvar, what the site still needs, below its loads' net ${g.need.toFixed(1)} kvar`,
      );
  }

  // 3. Central automatic bank for the rest; a remainder below the smallest unit is not worth a bank.
  const smallest = Math.min(...sizes);
  let centralKvar = required - terminalKvar - groupKvar;
  let differenceKvar = 0;
  if (centralKvar > EPS && centralKvar < smallest - EPS) {
    differenceKvar = centralKvar;
    notes.push(`the remaining ${centralKvar.toFixed(2)} kvar is below the smallest ${smallest} kvar unit: no central bank`);
    centralKvar = 0;
  }
  if (centralKvar <= EPS) centralKvar = 0;

  const centralLoads: string[] = [];
  let centralLoadNeed = 0;
  out.forEach((p, i) => {
    const l = input.loads[i] as PlacementLoad;
    const r = residual[i] as number;
    const inBank = l.group !== undefined && banked.has(l.group);
    const upstream = inBank ? `group:${l.group}` : centralKvar > 0 ? "central" : null;
    if (p.location === "terminal") {
      if (r > EPS)
        p.reason += `; the remaining ${r.toFixed(1)} kvar is corrected ${upstream === null ? "nowhere (the site needs no more)" : upstream === "central" ? "at the central bank" : `at its group bank ${l.group}`}`;
      if (r > EPS && upstream === "central") {
        centralLoads.push(l.label);
        centralLoadNeed += r;
      }
      return;
    }
    const why = p.reason === "" ? "" : ` (not at its terminals: ${p.reason})`;
    if (r <= EPS) {
      p.reason =
        l.kvar < 0
          ? `leading: adds no need, offsets ${(-l.kvar).toFixed(1)} kvar of the ${inBank ? "group's" : "site's"} lagging demand`
          : `at or above the target PF, needs no correction; its ${(-r).toFixed(1)} kvar margin lowers the ${inBank ? "group's" : "site's"} net need`;
      return;
    }
    if (upstream === null) {
      p.reason = `needs ${r.toFixed(1)} kvar but the site as a whole needs no more: the other corrections and the site basis cover it${why}`;
      return;
    }
    p.location = upstream as PlacementLocation;
    p.reason = `${r.toFixed(1)} kvar corrected at ${inBank ? `its group bank ${l.group}` : "the central automatic bank"}${why}`;
    if (!inBank) {
      centralLoads.push(l.label);
      centralLoadNeed += r;
    }
  });
  if (centralKvar > 0 && centralLoadNeed > centralKvar + 0.05) {
    notes.push(
      `the central bank's ${centralKvar.toFixed(1)} kvar is less than the ${centralLoadNeed.toFixed(1)} kvar its loads need: loads above the target PF (drives, leading lighting) and the site basis offset the difference`,
    );
  }
  const terminalLoads = out.filter((p) => p.location === "terminal").map((p) => p.label);
  if (terminalKvar > 0) locations.unshift({ location: "terminal", kvar: terminalKvar, loads: terminalLoads });
  if (centralKvar > 0) locations.push({ location: "central", kvar: centralKvar, loads: centralLoads });

  const totalKvar = terminalKvar + groupKvar + centralKvar;
  const sumNeed = out.reduce((s, p) => s + p.needKvar, 0);
  const basisGap = required - sumNeed;
  let balanceNote = `${totalKvar.toFixed(1)} kvar placed (terminal ${terminalKvar.toFixed(1)}, group ${groupKvar.toFixed(1)}, central ${centralKvar.toFixed(1)}) against the site's ${required.toFixed(1)} kvar`;
  if (Math.abs(differenceKvar) > EPS) balanceNote += `; ${differenceKvar.toFixed(2)} kvar short, below the smallest unit`;
  if (required <= EPS) {
    balanceNote = "nothing placed: the site as a whole needs no added kvar to reach the target";
  } else if (Math.abs(basisGap) > 0.05) {
    balanceNote +=
      basisGap > 0
        ? `; the site basis needs ${basisGap.toFixed(1)} kvar more than its loads add up to (unmetered loads or readings at different times), ${centralKvar > 0 ? "taken at the central bank" : "left uncorrected (below the smallest unit)"}`
        : `; the loads add up to ${(-basisGap).toFixed(1)} kvar more need than the site basis (diversity or readings at different times), so upstream banks are held to the site's figure`;
  }
  const unbalanced =
    input.systemPhases === 3
      ? out.filter((p, i) => input.loads[i]?.phases === 1 && (p.location === "central" || p.location.startsWith("group:")))
      : [];
  if (unbalanced.length > 0) {
    const list = unbalanced.map((p) => `${p.label} (${Math.max(0, p.needKvar).toFixed(1)} kvar)`).join(", ");
    // A balanced bank puts a third of its kvar on each phase; the single-phase need sits on one or two (common practice, no source).
    warnings.push(
      warning(
        "single_phase_on_three_phase_bank",
        `single-phase loads corrected by a balanced three-phase bank: ${list}; the bank spreads its kvar over three phases while their need sits on one or two, so the phases are corrected unevenly; if they are large, correct them at their terminals or spread them across the phases`,
        prefix,
      ),
    );
  }
  return {
    loads: out,
    locations,
    totalKvar,
    siteRequiredKvar: required,
    differenceKvar,
    balanceNote,
    notes,
    warnings: mergeBySubject(warnings, prefix),
  };
}

function conductorNoteText(ratedA: number, motorConductorAmpacityA: number | undefined): string {
  const byCurrent = `${(CONDUCTOR_AMPACITY_FACTOR * 100).toFixed(0)} % of the unit's ${ratedA.toFixed(1)} A rated current = ${(ratedA * CONDUCTOR_AMPACITY_FACTOR).toFixed(1)} A`;
  if (motorConductorAmpacityA === undefined) {
    return `conductors from the motor terminals to the capacitor: at least ${byCurrent}, and at least one third of the motor-circuit conductors' ampacity (NFPA 70 460.8(A)); give motorConductorAmpacityA to work that floor`;
  }
  return `conductors from the motor terminals to the capacitor: at least the larger of ${byCurrent} and one third of the ${motorConductorAmpacityA} A motor-circuit conductors = ${(motorConductorAmpacityA / 3).toFixed(1)} A (NFPA 70 460.8(A))`;
}
