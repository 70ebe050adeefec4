import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { TANK_CONTENTS } from '@shared/schemas';
import TankContentsBadge from '@/components/tank/TankContentsBadge.vue';
import { brick, ember } from '@/theme/preset';
import { CONTENTS_COLOURS } from '@/utils/contents';

/** Hue (degrees) and saturation (0–1) of a #rrggbb colour, as HSL defines them. */
function hueAndSaturation(hex: string): { hue: number; saturation: number } {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255) as [number, number, number];
  const max = Math.max(r, g, b);
  const min = Math.min(r, g, b);
  const d = max - min;
  const lightness = (max + min) / 2;
  const saturation = d === 0 ? 0 : d / (1 - Math.abs(2 * lightness - 1));
  let hue = 0;
  if (d !== 0) hue = max === r ? ((g - b) / d) % 6 : max === g ? (b - r) / d + 2 : (r - g) / d + 4;
  return { hue: (hue * 60 + 360) % 360, saturation };
}

const alarmColours = new Set([...Object.values(brick), ...Object.values(ember)].map((c) => c.toLowerCase()));

describe('contents colours', () => {
  it.each(TANK_CONTENTS)('keeps %s out of the alarm red and the low-stock amber', (contents) => {
    const look = CONTENTS_COLOURS[contents];
    for (const colour of [look.fill, look.stroke, look.ink, look.ground]) expect(alarmColours.has(colour.toLowerCase())).toBe(false);
  });

  it('gives pest solution a neutral hue of its own, not a red, with a pattern beside it', () => {
    const pest = CONTENTS_COLOURS['pest-solution'];
    for (const colour of [pest.fill, pest.stroke]) {
      const { hue, saturation } = hueAndSaturation(colour);
      // Neutral: barely saturated; and in no case a red (hues within 20° of 0°).
      expect(saturation).toBeLessThan(0.25);
      expect(Math.min(hue, 360 - hue)).toBeGreaterThan(20);
    }
    const others = TANK_CONTENTS.filter((c) => c !== 'pest-solution').map((c) => CONTENTS_COLOURS[c].fill);
    expect(others).not.toContain(pest.fill);
    expect(pest.line).toBe('dashed');
    expect(pest.hatched).toBe(true);
    expect(TANK_CONTENTS.filter((c) => CONTENTS_COLOURS[c].hatched || CONTENTS_COLOURS[c].line !== 'solid')).toEqual(['pest-solution']);
  });

  it('draws the pest-solution label in its own ink, striped, with its glyph and its name', () => {
    const wrapper = mount(TankContentsBadge, { props: { contents: 'pest-solution' } });
    const badge = wrapper.get('[data-testid="contents-pest-solution"]');

    expect(badge.classes()).toContain('contents-badge--hatched');
    expect(badge.attributes('style')).toContain(`--badge-ink: ${CONTENTS_COLOURS['pest-solution'].ink}`);
    expect(badge.find('svg').exists()).toBe(true);
    expect(badge.text()).toBe('Pest solution');
    expect(mount(TankContentsBadge, { props: { contents: 'water' } }).classes()).not.toContain('contents-badge--hatched');
  });
});
