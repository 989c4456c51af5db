/**
 * The form for the common case: one or two burns, a B-plane target and a closest-approach epoch at one
 * body. It can start from a loaded problem file; anything the form does not show (covariance, solar
 * pressure, limits, corrector settings…) is carried over from that file unchanged.
 */
import { BODY_NAMES, INERTIAL_FRAMES } from '../../../propagator/types.ts';
import { h, replaceChildren } from '../dom.ts';
import { FieldRegistry } from './form-fields.ts';

type Json = Record<string, unknown>;
const BURN_FRAMES = ['RTN', 'VNB', 'inertial'] as const;
const AXES: Record<string, readonly [string, string, string]> = {
  RTN: ['R', 'T', 'N'], VNB: ['V', 'N', 'B'], inertial: ['x', 'y', 'z'],
};

export interface ProblemForm {
  node: HTMLElement;
  fields: FieldRegistry;
  /** The problem as the form states it (not yet validated). */
  collect(): Json;
  /** Fills the form from a problem (and keeps it as the base for fields the form does not show). */
  fill(problem: Json): void;
}

function obj(v: unknown): Json { return v && typeof v === 'object' && !Array.isArray(v) ? v as Json : {}; }
function arr(v: unknown): unknown[] { return Array.isArray(v) ? v : []; }
function str(v: unknown): string | undefined { return v === undefined || v === null ? undefined : String(v); }

export function createProblemForm(): ProblemForm {
  let fields = new FieldRegistry();
  let base: Json = {};
  const node = h('div', { class: 'problem-form' });

  const build = (p: Json): void => {
    fields = new FieldRegistry();
    form.fields = fields;
    const sc = obj(p.spacecraft); const engine = obj(sc.engine); const st = obj(p.initialState); const fm = obj(p.forceModel);
    const burns = arr(p.burns).map(obj);
    const targets = arr(p.targets).map(obj);
    const bplane = targets.find((t) => t.kind === 'b-plane') ?? {};
    const ca = targets.find((t) => t.kind === 'closest-approach-epoch');
    const ee = p.executionErrors ? obj(p.executionErrors) : null;
    const disp = obj(p.dispersion);
    const burnCount = Math.min(Math.max(burns.length, 1), 2);
    const perturbing = new Set(arr(fm.perturbingBodies).map(String));

    const burnCountSelect = h('select', { id: 'pf-burn-count', name: 'burnCount' },
      ['1', '2'].map((n) => h('option', { value: n, ...(Number(n) === burnCount ? { selected: true } : {}) }, n)));
    const burnBox = h('div', { class: 'burns' });
    const collectBurns = (): Json[] => Array.from({ length: burnBox.querySelectorAll('fieldset.group').length }, (_, i) => ({
      label: fields.value(`burns[${i}].label`), epoch: fields.value(`burns[${i}].epoch`), frame: fields.value(`burns[${i}].frame`),
      deltaVGuessKmS: fields.vec(`burns[${i}].deltaVGuessKmS`),
    }));
    /** Redraws the burn groups, keeping what was typed (`fromForm`) or starting from the problem. */
    const drawBurns = (fromForm: boolean): void => {
      const count = Number(burnCountSelect.value);
      const current = fromForm ? collectBurns() : burns;
      replaceChildren(burnBox, Array.from({ length: count }, (_, i) => {
        const b = obj(current[i] ?? burns[i]);
        const frame = str(b.frame) || 'RTN';
        return fields.group(`burns[${i}]`, `Burn ${i + 1}`,
          h('div', { class: 'row' },
            fields.input(`burns[${i}].label`, 'Label', { value: str(b.label) ?? `TCM-${i + 1}` }),
            fields.input(`burns[${i}].epoch`, 'Epoch', { value: str(b.epoch) ?? '', help: 'ISO 8601 with the scale: …Z (UTC) or … TDB', wide: true }),
            fields.select(`burns[${i}].frame`, 'Δv axes', BURN_FRAMES, frame)),
          fields.vector(`burns[${i}].deltaVGuessKmS`, 'First guess of Δv', AXES[frame] ?? AXES.RTN, 'km/s', arr(b.deltaVGuessKmS) as number[]));
      }));
    };

    const eeToggle = h('input', { type: 'checkbox', id: 'pf-ee-on', ...(ee ? { checked: true } : {}) });
    const caToggle = h('input', { type: 'checkbox', id: 'pf-ca-on', ...(ca || targets.length === 0 ? { checked: true } : {}) });

    const kept = [
      p.title !== undefined ? 'title' : '', sc.solarPressure ? 'spacecraft.solarPressure' : '', st.covarianceKmKmS ? 'initialState.covarianceKmKmS' : '',
      fm.solarPressure ? 'forceModel.solarPressure' : '', fm.centralJ2 ? 'forceModel.centralJ2' : '', fm.relativeTolerance !== undefined ? 'forceModel.relativeTolerance' : '',
      fm.switching ? 'forceModel.switching' : '', p.limits ? 'limits' : '', p.corrector ? 'corrector' : '',
      burns.some((b) => b.freeComponents || b.boundsKmS || b.epochWindow) ? 'burn free components, bounds and epoch windows' : '',
      targets.length > (ca ? 2 : 1) ? 'NOTE: only the B-plane and closest-approach targets are kept' : '',
    ].filter(Boolean);
    replaceChildren(node,
      kept.length ? h('p', { class: 'kept', 'data-testid': 'kept-from-file' }, 'Also taken unchanged from the file (not shown in the form): ', kept.join(', '), '.') : null,
      h('div', { class: 'form-grid' },
        fields.group('spacecraft', 'Spacecraft',
          h('div', { class: 'row' },
            fields.input('spacecraft.name', 'Name', { value: str(sc.name) ?? '' }),
            fields.input('spacecraft.massKg', 'Wet mass', { unit: 'kg', value: str(sc.massKg) ?? '', inputmode: 'decimal' }),
            fields.input('spacecraft.engine.ispS', 'Specific impulse', { unit: 's', value: str(engine.ispS) ?? '', inputmode: 'decimal' }),
            fields.input('spacecraft.engine.thrustN', 'Thrust', { unit: 'N', value: str(engine.thrustN) ?? '', inputmode: 'decimal' }))),
        fields.group('initialState', 'Orbit-determination state',
          h('div', { class: 'row' },
            fields.input('initialState.epoch', 'Epoch', { value: str(st.epoch) ?? '', wide: true }),
            fields.select('initialState.centre', 'Centre', BODY_NAMES, str(st.centre) ?? 'sun'),
            fields.select('initialState.frame', 'Frame', INERTIAL_FRAMES, str(st.frame) ?? 'J2000_EQUATORIAL')),
          fields.vector('initialState.positionKm', 'Position', ['x', 'y', 'z'], 'km', arr(st.positionKm) as number[]),
          fields.vector('initialState.velocityKmS', 'Velocity', ['x', 'y', 'z'], 'km/s', arr(st.velocityKmS) as number[])),
        fields.group('forceModel', 'Span and forces',
          h('div', { class: 'row' },
            fields.input('endEpoch', 'End of span', { value: str(p.endEpoch) ?? '', wide: true }),
            fields.select('forceModel.centralBody', 'Central body', BODY_NAMES, str(fm.centralBody) ?? 'sun'),
            fields.select('forceModel.method', 'Propagation', ['cowell', 'encke'], str(fm.method) ?? 'cowell')),
          fields.group('forceModel.perturbingBodies', 'Third bodies',
            h('div', { class: 'checks' }, BODY_NAMES.map((b) => h('label', { class: 'check' },
              h('input', { type: 'checkbox', name: 'perturbing', value: b, ...(perturbing.has(b) ? { checked: true } : {}) }), ` ${b}`))))),
        h('div', { class: 'group-like' },
          h('div', { class: 'field' }, h('label', { for: 'pf-burn-count' }, 'Number of burns'), burnCountSelect),
          burnBox),
        fields.group('targets', 'Flyby targets',
          h('div', { class: 'row' },
            fields.select('targets[0].body', 'Body', BODY_NAMES, str(bplane.body) ?? 'mars'),
            fields.select('targets[0].referencePlane', 'B-plane reference plane', ['ecliptic', 'equator'], str(bplane.referencePlane) ?? 'ecliptic'),
            fields.input('targets[0].bDotTKm', 'B·T', { unit: 'km', value: str(bplane.bDotTKm) ?? '', inputmode: 'decimal' }),
            fields.input('targets[0].bDotRKm', 'B·R', { unit: 'km', value: str(bplane.bDotRKm) ?? '', inputmode: 'decimal' }),
            fields.input('targets[0].toleranceKm', 'Tolerance', { unit: 'km', value: str(bplane.toleranceKm) ?? '1', inputmode: 'decimal' })),
          h('div', { class: 'row' },
            h('label', { class: 'check', for: 'pf-ca-on' }, caToggle, ' Also target the closest-approach time'),
            fields.input('targets[1].epoch', 'Closest approach at', { value: str(ca?.epoch) ?? '', wide: true }),
            fields.input('targets[1].toleranceS', 'Tolerance', { unit: 's', value: str(ca?.toleranceS) ?? '1', inputmode: 'decimal' }))),
        fields.group('executionErrors', 'Execution errors (1σ) and dispersion',
          h('label', { class: 'check', for: 'pf-ee-on' }, eeToggle, ' Model execution errors'),
          h('div', { class: 'row' },
            fields.input('executionErrors.fixedMagnitudeMS', 'Fixed magnitude', { unit: 'm/s', value: str(ee?.fixedMagnitudeMS) ?? '0.01', inputmode: 'decimal' }),
            fields.input('executionErrors.proportionalMagnitudeFraction', 'Proportional magnitude', { unit: 'fraction', value: str(ee?.proportionalMagnitudeFraction) ?? '0.01', inputmode: 'decimal' }),
            fields.input('executionErrors.fixedPointingMS', 'Fixed pointing', { unit: 'm/s', value: str(ee?.fixedPointingMS) ?? '0.01', inputmode: 'decimal' }),
            fields.input('executionErrors.proportionalPointingDeg', 'Proportional pointing', { unit: 'deg', value: str(ee?.proportionalPointingDeg) ?? '0.5', inputmode: 'decimal' })),
          h('div', { class: 'row' },
            fields.input('dispersion.samples', 'Monte Carlo samples', { value: str(disp.samples) ?? '200', inputmode: 'numeric' }),
            fields.input('dispersion.seed', 'Seed', { value: str(disp.seed) ?? '1', inputmode: 'numeric' })))));

    burnCountSelect.addEventListener('change', () => drawBurns(true));
    burnBox.addEventListener('change', (e) => { if ((e.target as HTMLElement).matches('select[name$=".frame"]')) drawBurns(true); });
    drawBurns(false);
    form.collectBurns = collectBurns;
    form.perturbingBoxes = () => Array.from(node.querySelectorAll<HTMLInputElement>('input[name="perturbing"]'));
    form.toggles = { ee: eeToggle, ca: caToggle };
  };

  const form: ProblemForm & {
    collectBurns: null | (() => Json[]);
    perturbingBoxes: () => HTMLInputElement[];
    toggles: { ee: HTMLInputElement; ca: HTMLInputElement } | null;
  } = {
    node, fields, collectBurns: null, perturbingBoxes: () => [], toggles: null,
    collect() {
      const p: Json = structuredClone(base);
      const f = fields;
      const opt = (v: string): string | undefined => (v === '' ? undefined : v);
      p.spacecraft = { ...obj(base.spacecraft), name: f.value('spacecraft.name'), massKg: f.number('spacecraft.massKg'),
        engine: { ispS: f.number('spacecraft.engine.ispS'), thrustN: f.number('spacecraft.engine.thrustN') } };
      p.initialState = { ...obj(base.initialState), epoch: f.value('initialState.epoch'), centre: f.value('initialState.centre'),
        frame: f.value('initialState.frame'), positionKm: f.vec('initialState.positionKm'), velocityKmS: f.vec('initialState.velocityKmS') };
      p.endEpoch = f.value('endEpoch');
      p.forceModel = { ...obj(base.forceModel), centralBody: f.value('forceModel.centralBody'), method: f.value('forceModel.method'),
        perturbingBodies: form.perturbingBoxes().filter((b) => b.checked).map((b) => b.value) };
      const baseBurns = arr(base.burns).map(obj);
      p.burns = (form.collectBurns?.() ?? []).map((b, i) => {
        const merged: Json = { ...baseBurns[i], ...b, label: opt(String(b.label)) };
        if (merged.label === undefined) delete merged.label;
        return merged;
      });
      const body = f.value('targets[0].body');
      const targets: Json[] = [{ kind: 'b-plane', body, referencePlane: f.value('targets[0].referencePlane'),
        bDotTKm: f.number('targets[0].bDotTKm'), bDotRKm: f.number('targets[0].bDotRKm'), toleranceKm: f.number('targets[0].toleranceKm') }];
      if (form.toggles?.ca.checked) {
        targets.push({ kind: 'closest-approach-epoch', body, epoch: f.value('targets[1].epoch'), toleranceS: f.number('targets[1].toleranceS') });
      }
      p.targets = targets;
      if (form.toggles?.ee.checked) {
        p.executionErrors = {
          fixedMagnitudeMS: f.number('executionErrors.fixedMagnitudeMS'),
          proportionalMagnitudeFraction: f.number('executionErrors.proportionalMagnitudeFraction'),
          fixedPointingMS: f.number('executionErrors.fixedPointingMS'),
          proportionalPointingDeg: f.number('executionErrors.proportionalPointingDeg'),
        };
      } else {
        delete p.executionErrors;
      }
      p.dispersion = { samples: f.number('dispersion.samples'), seed: f.number('dispersion.seed') };
      return p;
    },
    fill(problem) {
      base = structuredClone(problem);
      build(problem);
    },
  };
  build({});
  return form;
}
