import { config } from '@vue/test-utils';
import { i18n, setLanguage } from '@/i18n';

// Every mounted component gets the app's vue-i18n, in English unless a test switches language.
config.global.plugins.push(i18n);
setLanguage('en');
