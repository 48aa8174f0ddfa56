/** Type-level tests: the public types follow the chain and reject wrong slots at compile time. */
import { describe, expectTypeOf, it } from 'vitest';
import type { FitResult } from '../../src/fit/index.js';
import { fit } from '../../src/fit/index.js';
import {
  type ComplexColumns,
  disk,
  type Model,
  type ObservableJacobian,
  observableJacobian,
  type Param,
  param,
  point,
  type Slot,
  sum,
} from '../../src/index.js';
import type { OifitsDataset } from '../../src/oifits/index.js';

describe('types', () => {
  it('factories and operators return models', () => {
    expectTypeOf(disk({ diameter: 1 })).toEqualTypeOf<Model>();
    expectTypeOf(
      point().shift(1, 2).weight(0.5).rotate(10).stretch(1, 2).incline(30, 40),
    ).toEqualTypeOf<Model>();
    expectTypeOf(sum(point(), disk({ diameter: 2 }))).toEqualTypeOf<Model>();
  });

  it('a slot takes a number or a param, not a string', () => {
    expectTypeOf(param('d', 1)).toEqualTypeOf<Param>();
    expectTypeOf<number>().toMatchTypeOf<Slot>();
    expectTypeOf<Param>().toMatchTypeOf<Slot>();
    // @ts-expect-error a diameter is not a string
    disk({ diameter: '1.2' });
  });

  it('evaluation returns typed arrays and complex columns', () => {
    const m = disk({ diameter: 1 });
    expectTypeOf(m.vis2([1], [2])).toEqualTypeOf<Float64Array>();
    expectTypeOf(m.visibilities([1], [2])).toEqualTypeOf<ComplexColumns>();
    expectTypeOf(m.closurePhase([1], [1], [2], [2])).toEqualTypeOf<Float64Array>();
    expectTypeOf(observableJacobian(m, 'vis2', { u: [1], v: [2] })).toEqualTypeOf<ObservableJacobian>();
    // @ts-expect-error an unknown observable name
    observableJacobian(m, 'vis3', { u: [1], v: [2] });
  });

  it('fit takes a model and a dataset and gives a FitResult with records by name', () => {
    expectTypeOf(fit).parameters.toEqualTypeOf<
      [Model, OifitsDataset, (Parameters<typeof fit>[2] | undefined)?]
    >();
    expectTypeOf<FitResult['values']>().toEqualTypeOf<Readonly<Record<string, number>>>();
  });
});
