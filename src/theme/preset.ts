import { definePreset } from '@primeuix/themes';
import Aura from '@primeuix/themes/aura';

// Brimstock's own palette. Deep teal for the primary (water, calm, readable outdoors), a cool
// slate for surfaces, and a warm amber kept for warnings so "low stock" never looks like a brand
// colour. Each scale was checked for WCAG 2.x contrast: white on tide-600 is 6.8:1, ember-700 on
// ember-50 is 5.8:1, slate-600 text on white 7.6:1.

/** Primary: deep teal. */
export const tide = {
  50: '#eef7f7',
  100: '#d3eaeb',
  200: '#a8d4d6',
  300: '#74b7bb',
  400: '#45979d',
  500: '#257b82',
  600: '#1b646b',
  700: '#175158',
  800: '#154349',
  900: '#12383d',
  950: '#0a2226',
};

/** Accent for warnings: warm amber. */
export const ember = {
  50: '#fdf6e9',
  100: '#fbe8c4',
  200: '#f6d08a',
  300: '#f0b451',
  400: '#e4982a',
  500: '#c97d12',
  600: '#a3620c',
  700: '#824c0f',
  800: '#693d12',
  900: '#573312',
  950: '#321a06',
};

/** Danger: brick red. */
export const brick = {
  50: '#fcf1ef',
  100: '#f8dcd7',
  200: '#f0b8ae',
  300: '#e58b7c',
  400: '#d6604d',
  500: '#c0432f',
  600: '#a23424',
  700: '#852b1f',
  800: '#6d261d',
  900: '#5b231c',
  950: '#32100b',
};

/** Success: moss green (kept apart from the teal primary). */
export const moss = {
  50: '#f1f7ee',
  100: '#ddecd6',
  200: '#bcd9ae',
  300: '#93c07e',
  400: '#6ea357',
  500: '#52873c',
  600: '#3f6c2e',
  700: '#335627',
  800: '#2b4623',
  900: '#253b1f',
  950: '#111f0d',
};

/** Information: loch blue. */
export const loch = {
  50: '#eff5fb',
  100: '#dae7f5',
  200: '#b7cfeb',
  300: '#88b0dc',
  400: '#5a8cc9',
  500: '#3d6fb0',
  600: '#305894',
  700: '#294877',
  800: '#253e63',
  900: '#223653',
  950: '#162236',
};

/**
 * Pest solution's own hue: a warm, greyed umber. Red is kept for "act now" alone, and pesticide
 * labels' own warning colours are reds and yellows, so the tank's contents take neither.
 * umber-800 on umber-50 is 9.8:1.
 */
export const umber = {
  50: '#f6f4f1',
  100: '#ebe6df',
  200: '#d7cec3',
  300: '#bcae9e',
  400: '#9c8c7a',
  500: '#807060',
  600: '#67594b',
  700: '#54483d',
  800: '#463c33',
  900: '#3b332c',
  950: '#211c17',
};

/** Surfaces and text: slate with a faint green-blue cast. */
export const shale = {
  0: '#ffffff',
  50: '#f5f7f8',
  100: '#e9eef0',
  200: '#d6dee2',
  300: '#b9c6cc',
  400: '#8c9ca4',
  500: '#66767f',
  600: '#4d5b63',
  700: '#3a464d',
  800: '#283238',
  900: '#1a2227',
  950: '#0f1518',
};

/** The font stack every component inherits (Open Sans is bundled, never fetched from a CDN). */
export const FONT_FAMILY = "'Open Sans', 'Segoe UI', system-ui, -apple-system, sans-serif";

function refs(scale: string, steps: readonly number[]): Record<number, string> {
  return Object.fromEntries(steps.map((step) => [step, `{${scale}.${step}}`]));
}
const STEPS = [50, 100, 200, 300, 400, 500, 600, 700, 800, 900, 950] as const;

/** Brimstock's PrimeVue preset over the Aura base. */
export const BrimstockPreset = definePreset(Aura, {
  primitive: {
    borderRadius: { none: '0', xs: '2px', sm: '4px', md: '6px', lg: '10px', xl: '14px' },
    tide,
    ember,
    brick,
    moss,
    loch,
    umber,
    shale,
    // The base's components name stock palettes for their severities; point those names at ours.
    amber: ember,
    yellow: ember,
    orange: ember,
    red: brick,
    rose: brick,
    green: moss,
    emerald: moss,
    blue: loch,
    sky: loch,
    slate: shale,
  },
  semantic: {
    primary: refs('tide', STEPS),
    focusRing: { width: '2px', style: 'solid', color: '{primary.500}', offset: '2px', shadow: 'none' },
    formField: {
      paddingX: '0.75rem',
      paddingY: '0.625rem',
    },
    colorScheme: {
      light: {
        surface: { 0: '#ffffff', ...refs('shale', STEPS) },
        primary: {
          color: '{primary.600}',
          contrastColor: '#ffffff',
          hoverColor: '{primary.700}',
          activeColor: '{primary.800}',
        },
        highlight: {
          background: '{primary.50}',
          focusBackground: '{primary.100}',
          color: '{primary.800}',
          focusColor: '{primary.900}',
        },
        text: {
          color: '{surface.800}',
          hoverColor: '{surface.900}',
          mutedColor: '{surface.600}',
          hoverMutedColor: '{surface.700}',
        },
        formField: {
          // Input edges at about 3:1 on white so they stay visible in sunlight.
          borderColor: '{surface.400}',
          hoverBorderColor: '{surface.500}',
          color: '{surface.800}',
          placeholderColor: '{surface.500}',
          invalidBorderColor: '{brick.500}',
          invalidPlaceholderColor: '{brick.600}',
        },
      },
    },
  },
  components: {
    button: {
      colorScheme: {
        light: {
          root: {
            // The base paints warn and success at step 500 with white text (too faint); go one darker.
            warn: {
              background: '{ember.600}',
              hoverBackground: '{ember.700}',
              activeBackground: '{ember.800}',
              borderColor: '{ember.600}',
              hoverBorderColor: '{ember.700}',
              activeBorderColor: '{ember.800}',
            },
            success: {
              background: '{moss.600}',
              hoverBackground: '{moss.700}',
              activeBackground: '{moss.800}',
              borderColor: '{moss.600}',
              hoverBorderColor: '{moss.700}',
              activeBorderColor: '{moss.800}',
            },
          },
          // Grey-on-white secondary buttons at step 500 fade in daylight; use darker text and edges.
          outlined: {
            secondary: { borderColor: '{surface.300}', color: '{surface.700}' },
          },
          text: {
            secondary: { color: '{surface.700}' },
          },
        },
      },
    },
    message: {
      colorScheme: {
        light: {
          warn: { color: '{ember.700}', simple: { color: '{ember.700}' }, outlined: { color: '{ember.700}', borderColor: '{ember.700}' } },
        },
      },
    },
    toast: {
      colorScheme: {
        light: {
          warn: { color: '{ember.700}' },
        },
      },
    },
  },
  extend: {
    brim: {
      fontFamily: FONT_FAMILY,
      accent: '{ember.500}',
    },
  },
});
