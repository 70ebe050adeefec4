// The words and numbers around a tank's stock figures (shared/readings stockFigures), the same on the
// round, the stock board, the farm page and the tank page, in the screens' language.
import type { StockFigures } from '@shared/readings';
import { formatNumber, formatVolume, type UnitSystem } from '@shared/units';
import { i18n, onLanguageChange } from '@/i18n';

// The names below are live bindings: they are set again whenever the language changes, so a template
// (or a computed that also formats a figure, which follows the language) shows the current word.
/** What the main figure is called ("usable"). */
export let USABLE_NAME = '';
/** What the secondary figure is called ("in the tank"). */
export let TOTAL_NAME = '';
/** What the percentage is of ("usable capacity"), and what that means. */
export let USABLE_CAPACITY_NAME = '';
export let USABLE_CAPACITY_MEANING = '';

function nameFigures(): void {
  const { t } = i18n.global;
  USABLE_NAME = t('words.stock.usable');
  TOTAL_NAME = t('words.stock.total');
  USABLE_CAPACITY_NAME = t('words.stock.usableCapacity');
  USABLE_CAPACITY_MEANING = t('words.stock.usableCapacityMeaning');
}
nameFigures();
onLanguageChange(nameFigures);

/** The figures as text in the user's units: "27,157 L", "29,900 L", "52 %" (null without a usable capacity), "52,203 L". */
export function stockTexts(f: StockFigures, system: UnitSystem): { usable: string; total: string; percent: string | null; capacity: string } {
  return {
    usable: formatVolume(f.usableL, system),
    total: formatVolume(f.totalL, system),
    percent: f.percentOfUsableCapacity === null ? null : `${formatNumber(f.percentOfUsableCapacity, 0)} %`,
    capacity: formatVolume(f.usableCapacityL, system),
  };
}

/** One sentence for screen readers: "27,157 L usable, 52 % of the 52,203 L usable capacity; 29,900 L in the tank". */
export function stockSentence(f: StockFigures, system: UnitSystem): string {
  const texts = stockTexts(f, system);
  const { t } = i18n.global;
  return texts.percent === null ? t('words.stock.sentence', texts) : t('words.stock.sentenceWithShare', texts);
}
