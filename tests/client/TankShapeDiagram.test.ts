import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { defineComponent, h } from 'vue';
import { HORIZONTAL_ENDS, TANK_SHAPES, TANK_SHAPE_FIELDS, type HorizontalEnds, type TankShape } from '@shared/calibration';
import TankShapeDiagram from '@/components/tank/TankShapeDiagram.vue';
import { POINT_LABELS, SHAPE_SPECS } from '@/components/tank/tankShapes';

const CASES: [TankShape, HorizontalEnds][] = TANK_SHAPES.flatMap((shape) =>
  shape === 'horizontal-cylinder' ? HORIZONTAL_ENDS.map((ends) => [shape, ends] as [TankShape, HorizontalEnds]) : [[shape, 'flat'] as [TankShape, HorizontalEnds]],
);

function expectedLabels(shape: TankShape): string[] {
  return shape === 'points' ? [POINT_LABELS.level, POINT_LABELS.volume] : SHAPE_SPECS[shape].sizes.map((s) => s.label);
}

describe('TankShapeDiagram', () => {
  it.each(CASES)('draws %s (%s ends) with one labelled arrow per size field', (shape, ends) => {
    const wrapper = mount(TankShapeDiagram, { props: { shape, ends } });

    const svg = wrapper.get('[data-testid="tank-diagram"]');
    expect(svg.attributes('data-shape')).toBe(shape);
    expect(wrapper.get('.tank-diagram__outline').attributes('d')).toMatch(/^M[\d.]+,[\d.]+ .+Z$/);
    const labels = wrapper.findAll('[data-testid="tank-diagram-label"]').map((t) => t.text());
    expect(labels).toEqual(expectedLabels(shape));
    expect(wrapper.findAll('.tank-diagram__arrow')).toHaveLength(labels.length);
    for (const label of labels) expect(svg.attributes('aria-label')).toContain(label);
  });

  it.each(TANK_SHAPES.filter((s) => s !== 'points'))('labels every size the engine needs for %s', (shape) => {
    const fields = TANK_SHAPE_FIELDS[shape].filter((f) => f !== 'ends');
    expect(SHAPE_SPECS[shape].sizes.map((s) => s.field)).toEqual(fields);
  });

  it('draws the heads of a horizontal tank only when its ends are not flat', () => {
    const outline = (ends: HorizontalEnds) => mount(TankShapeDiagram, { props: { shape: 'horizontal-cylinder', ends } }).get('.tank-diagram__outline').attributes('d');

    expect(outline('flat')).not.toContain('A');
    expect(outline('hemispherical')).toContain('A55,55');
    // A 2:1 head is a quarter of the diameter deep: half the depth of a hemisphere.
    expect(outline('ellipsoidal-2to1')).toContain('A27.5,55');
  });

  it('leaves arrows and labels out of a compact drawing', () => {
    const wrapper = mount(TankShapeDiagram, { props: { shape: 'cone-bottom', compact: true } });

    expect(wrapper.find('[data-testid="tank-diagram-label"]').exists()).toBe(false);
    expect(wrapper.get('[data-testid="tank-diagram"]').attributes('aria-label')).toBe('Cone bottom');
  });

  it('gives each drawing its own clip path so two on one page do not share one', () => {
    const page = defineComponent({ render: () => h('div', [h(TankShapeDiagram, { shape: 'sphere' }), h(TankShapeDiagram, { shape: 'sphere', compact: true })]) });
    const wrapper = mount(page);

    const ids = wrapper.findAll('clipPath').map((c) => c.attributes('id'));
    expect(ids).toHaveLength(2);
    expect(ids[0]).not.toBe(ids[1]);
    const used = wrapper.findAll('g[clip-path]').map((g) => g.attributes('clip-path'));
    expect(used).toEqual(ids.map((id) => `url(#${id})`));
  });
});
