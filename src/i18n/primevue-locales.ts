// PrimeVue's own words — ConfirmDialog's Yes and No, DatePicker's months, days and buttons, the paginator's and
// dialogs' aria labels, FileUpload's Choose, empty-list messages, password strength — in the screens' language.
// English is PrimeVue's default; Spanish and French are written here (the trade's forms of address: usted, vous).
import type { App } from 'vue';
import { defaultOptions, type PrimeVueConfiguration, type PrimeVueLocaleAriaOptions, type PrimeVueLocaleOptions } from 'primevue/config';
import { LANGUAGE_LOCALES, type Language } from '@shared/i18n/languages';
import { currentLanguage, onLanguageChange } from '@/i18n';

/** Every word PrimeVue 4.5 looks up, aria labels included. */
export type PrimeVueWords = Required<Omit<PrimeVueLocaleOptions, 'aria'>> & { aria: Required<PrimeVueLocaleAriaOptions> };

/** The names DatePicker writes and reads, taken from Intl so a typed date matches formatDateTime (src/utils/format.ts). */
type CalendarNames = Pick<PrimeVueWords, 'monthNames' | 'monthNamesShort' | 'dayNames' | 'dayNamesShort'>;

type HandWords = Omit<PrimeVueWords, keyof CalendarNames>;

function calendarNames(locale: string): CalendarNames {
  const months = Array.from({ length: 12 }, (_, m) => new Date(Date.UTC(2026, m, 15, 12)));
  // 1 March 2026 is a Sunday: PrimeVue's day lists start on Sunday whatever the first day of the week.
  const days = Array.from({ length: 7 }, (_, i) => new Date(Date.UTC(2026, 2, 1 + i, 12)));
  const long = new Intl.DateTimeFormat(locale, { month: 'long', timeZone: 'UTC' });
  // The short month exactly as the medium date style writes it ("3 mar 2026", "3 janv. 2026"): datePickerFormat's pattern uses it.
  const medium = new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' });
  const weekday = (style: 'long' | 'short') => new Intl.DateTimeFormat(locale, { weekday: style, timeZone: 'UTC' });
  return {
    monthNames: months.map((d) => long.format(d)),
    monthNamesShort: months.map((d) => medium.formatToParts(d).find((p) => p.type === 'month')?.value ?? long.format(d)),
    dayNames: days.map((d) => weekday('long').format(d)),
    dayNamesShort: days.map((d) => weekday('short').format(d)),
  };
}

const SPANISH: HandWords = {
  startsWith: 'Empieza por',
  contains: 'Contiene',
  notContains: 'No contiene',
  endsWith: 'Termina en',
  equals: 'Igual a',
  notEquals: 'Distinto de',
  noFilter: 'Sin filtro',
  lt: 'Menor que',
  lte: 'Menor o igual que',
  gt: 'Mayor que',
  gte: 'Mayor o igual que',
  dateIs: 'La fecha es',
  dateIsNot: 'La fecha no es',
  dateBefore: 'La fecha es anterior a',
  dateAfter: 'La fecha es posterior a',
  clear: 'Borrar',
  apply: 'Aplicar',
  matchAll: 'Cumplir todas',
  matchAny: 'Cumplir alguna',
  addRule: 'Añadir regla',
  removeRule: 'Quitar regla',
  accept: 'Sí',
  reject: 'No',
  choose: 'Elegir',
  upload: 'Subir',
  cancel: 'Cancelar',
  completed: 'Completado',
  pending: 'Pendiente',
  fileSizeTypes: ['B', 'KB', 'MB', 'GB', 'TB', 'PB', 'EB', 'ZB', 'YB'],
  // Spanish calendars write miércoles as X, so it is not taken for martes.
  dayNamesMin: ['D', 'L', 'M', 'X', 'J', 'V', 'S'],
  chooseYear: 'Elegir año',
  chooseMonth: 'Elegir mes',
  chooseDate: 'Elegir fecha',
  prevDecade: 'Década anterior',
  nextDecade: 'Década siguiente',
  prevYear: 'Año anterior',
  nextYear: 'Año siguiente',
  prevMonth: 'Mes anterior',
  nextMonth: 'Mes siguiente',
  prevHour: 'Hora anterior',
  nextHour: 'Hora siguiente',
  prevMinute: 'Minuto anterior',
  nextMinute: 'Minuto siguiente',
  prevSecond: 'Segundo anterior',
  nextSecond: 'Segundo siguiente',
  am: 'a. m.',
  pm: 'p. m.',
  today: 'Hoy',
  weekHeader: 'Sem.',
  firstDayOfWeek: 1,
  showMonthAfterYear: false,
  dateFormat: 'dd/mm/yy',
  weak: 'Débil',
  medium: 'Media',
  strong: 'Fuerte',
  passwordPrompt: 'Escriba una contraseña',
  emptyFilterMessage: 'Ningún resultado',
  searchMessage: '{0} resultados disponibles',
  selectionMessage: '{0} elementos seleccionados',
  emptySelectionMessage: 'Ningún elemento seleccionado',
  emptySearchMessage: 'Ningún resultado',
  fileChosenMessage: '{0} archivos',
  noFileChosenMessage: 'Ningún archivo elegido',
  emptyMessage: 'No hay opciones',
  aria: {
    trueLabel: 'Verdadero',
    falseLabel: 'Falso',
    nullLabel: 'Sin seleccionar',
    star: '1 estrella',
    stars: '{star} estrellas',
    selectAll: 'Todos los elementos seleccionados',
    unselectAll: 'Ningún elemento seleccionado',
    close: 'Cerrar',
    previous: 'Anterior',
    next: 'Siguiente',
    navigation: 'Navegación',
    scrollTop: 'Volver arriba',
    moveTop: 'Mover al principio',
    moveUp: 'Subir',
    moveDown: 'Bajar',
    moveBottom: 'Mover al final',
    moveToTarget: 'Mover al destino',
    moveToSource: 'Mover al origen',
    moveAllToTarget: 'Mover todo al destino',
    moveAllToSource: 'Mover todo al origen',
    pageLabel: 'Página {page}',
    firstPageLabel: 'Primera página',
    lastPageLabel: 'Última página',
    nextPageLabel: 'Página siguiente',
    prevPageLabel: 'Página anterior',
    rowsPerPageLabel: 'Filas por página',
    jumpToPageDropdownLabel: 'Lista para ir a una página',
    jumpToPageInputLabel: 'Campo para ir a una página',
    selectRow: 'Fila seleccionada',
    unselectRow: 'Fila no seleccionada',
    expandRow: 'Fila desplegada',
    collapseRow: 'Fila plegada',
    showFilterMenu: 'Mostrar el menú de filtro',
    hideFilterMenu: 'Ocultar el menú de filtro',
    filterOperator: 'Operador del filtro',
    filterConstraint: 'Condición del filtro',
    editRow: 'Editar la fila',
    saveEdit: 'Guardar los cambios',
    cancelEdit: 'Descartar los cambios',
    listView: 'Vista de lista',
    gridView: 'Vista de cuadrícula',
    slide: 'Diapositiva',
    slideNumber: '{slideNumber}',
    zoomImage: 'Ampliar la imagen',
    zoomIn: 'Acercar',
    zoomOut: 'Alejar',
    rotateRight: 'Girar a la derecha',
    rotateLeft: 'Girar a la izquierda',
    listLabel: 'Lista de opciones',
  },
};

const FRENCH: HandWords = {
  startsWith: 'Commence par',
  contains: 'Contient',
  notContains: 'Ne contient pas',
  endsWith: 'Se termine par',
  equals: 'Égal à',
  notEquals: 'Différent de',
  noFilter: 'Aucun filtre',
  lt: 'Inférieur à',
  lte: 'Inférieur ou égal à',
  gt: 'Supérieur à',
  gte: 'Supérieur ou égal à',
  dateIs: 'La date est le',
  dateIsNot: 'La date n’est pas le',
  dateBefore: 'La date est avant le',
  dateAfter: 'La date est après le',
  clear: 'Effacer',
  apply: 'Appliquer',
  matchAll: 'Toutes les règles',
  matchAny: 'Au moins une règle',
  addRule: 'Ajouter une règle',
  removeRule: 'Retirer la règle',
  accept: 'Oui',
  reject: 'Non',
  choose: 'Choisir',
  upload: 'Envoyer',
  cancel: 'Annuler',
  completed: 'Terminé',
  pending: 'En attente',
  // Octets, as French writes file sizes.
  fileSizeTypes: ['o', 'Ko', 'Mo', 'Go', 'To', 'Po', 'Eo', 'Zo', 'Yo'],
  dayNamesMin: ['di', 'lu', 'ma', 'me', 'je', 've', 'sa'],
  chooseYear: 'Choisir l’année',
  chooseMonth: 'Choisir le mois',
  chooseDate: 'Choisir la date',
  prevDecade: 'Décennie précédente',
  nextDecade: 'Décennie suivante',
  prevYear: 'Année précédente',
  nextYear: 'Année suivante',
  prevMonth: 'Mois précédent',
  nextMonth: 'Mois suivant',
  prevHour: 'Heure précédente',
  nextHour: 'Heure suivante',
  prevMinute: 'Minute précédente',
  nextMinute: 'Minute suivante',
  prevSecond: 'Seconde précédente',
  nextSecond: 'Seconde suivante',
  am: 'AM',
  pm: 'PM',
  today: 'Aujourd’hui',
  weekHeader: 'Sem.',
  firstDayOfWeek: 1,
  showMonthAfterYear: false,
  dateFormat: 'dd/mm/yy',
  weak: 'Faible',
  medium: 'Moyen',
  strong: 'Fort',
  passwordPrompt: 'Saisissez un mot de passe',
  emptyFilterMessage: 'Aucun résultat',
  searchMessage: '{0} résultats disponibles',
  selectionMessage: '{0} éléments sélectionnés',
  emptySelectionMessage: 'Aucun élément sélectionné',
  emptySearchMessage: 'Aucun résultat',
  fileChosenMessage: '{0} fichiers',
  noFileChosenMessage: 'Aucun fichier choisi',
  emptyMessage: 'Aucune option disponible',
  aria: {
    trueLabel: 'Vrai',
    falseLabel: 'Faux',
    nullLabel: 'Non sélectionné',
    star: '1 étoile',
    stars: '{star} étoiles',
    selectAll: 'Tous les éléments sélectionnés',
    unselectAll: 'Aucun élément sélectionné',
    close: 'Fermer',
    previous: 'Précédent',
    next: 'Suivant',
    navigation: 'Navigation',
    scrollTop: 'Remonter en haut',
    moveTop: 'Placer en premier',
    moveUp: 'Monter',
    moveDown: 'Descendre',
    moveBottom: 'Placer en dernier',
    moveToTarget: 'Déplacer vers la destination',
    moveToSource: 'Déplacer vers la source',
    moveAllToTarget: 'Tout déplacer vers la destination',
    moveAllToSource: 'Tout déplacer vers la source',
    pageLabel: 'Page {page}',
    firstPageLabel: 'Première page',
    lastPageLabel: 'Dernière page',
    nextPageLabel: 'Page suivante',
    prevPageLabel: 'Page précédente',
    rowsPerPageLabel: 'Lignes par page',
    jumpToPageDropdownLabel: 'Liste pour aller à une page',
    jumpToPageInputLabel: 'Champ pour aller à une page',
    selectRow: 'Ligne sélectionnée',
    unselectRow: 'Ligne désélectionnée',
    expandRow: 'Ligne dépliée',
    collapseRow: 'Ligne repliée',
    showFilterMenu: 'Afficher le menu de filtre',
    hideFilterMenu: 'Masquer le menu de filtre',
    filterOperator: 'Opérateur du filtre',
    filterConstraint: 'Condition du filtre',
    editRow: 'Modifier la ligne',
    saveEdit: 'Enregistrer les modifications',
    cancelEdit: 'Annuler les modifications',
    listView: 'Vue en liste',
    gridView: 'Vue en grille',
    slide: 'Diapositive',
    slideNumber: '{slideNumber}',
    zoomImage: 'Agrandir l’image',
    zoomIn: 'Zoom avant',
    zoomOut: 'Zoom arrière',
    rotateRight: 'Pivoter à droite',
    rotateLeft: 'Pivoter à gauche',
    listLabel: 'Liste d’options',
  },
};

const HAND_WORDS: Partial<Record<Language, HandWords>> = { es: SPANISH, fr: FRENCH };

/** PrimeVue's words in `language`: PrimeVue's own English for en, a fresh copy each time. */
export function primeVueLocaleOf(language: Language): PrimeVueWords {
  const english = defaultOptions.locale as PrimeVueWords;
  const words = HAND_WORDS[language];
  if (!words) return structuredClone(english);
  return { ...structuredClone(words), ...calendarNames(LANGUAGE_LOCALES[language]) };
}

/** PrimeVue's config of an app that has installed PrimeVue (app.use(PrimeVue) before this plugin). */
function primeVueConfigOf(app: App): PrimeVueConfiguration {
  const primevue = app.config.globalProperties.$primevue as { config: PrimeVueConfiguration } | undefined;
  if (!primevue) throw new Error('Install PrimeVue before primeVueLanguage');
  return primevue.config;
}

/**
 * A plugin, installed after PrimeVue, that gives PrimeVue the screens' language now and after every
 * setLanguage(), so a ConfirmDialog, DatePicker or paginator open at the time re-renders in it.
 */
export const primeVueLanguage = {
  install(app: App): void {
    const config = primeVueConfigOf(app);
    config.locale = primeVueLocaleOf(currentLanguage());
    const stop = onLanguageChange((language) => {
      config.locale = primeVueLocaleOf(language);
    });
    app.onUnmount(stop);
  },
};
