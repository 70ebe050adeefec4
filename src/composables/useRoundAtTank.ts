import { nextTick, onMounted, ref, watch } from 'vue';
import { useRoute } from 'vue-router';
import { useI18n } from 'vue-i18n';
import { useFarmsStore } from '@/stores/farms';
import { useRoundStore } from '@/stores/round';
import { useTanksStore } from '@/stores/tanks';

/** The tank id of a `?tank=` query value, or null when it is not a positive whole number. */
function tankIdOf(raw: unknown): number | null {
  const value = Array.isArray(raw) ? raw[0] : raw;
  if (typeof value !== 'string' || !/^[1-9]\d{0,15}$/.test(value)) return null;
  const id = Number(value);
  return Number.isSafeInteger(id) ? id : null;
}

/**
 * Starts the round, at the tank named by `?tank=<id>` (the link in a tank label's QR code) when
 * there is one: that tank's farm is walked, its card scrolled into view and its reading box focused.
 * `notice` says why when the label's tank is not on the round.
 */
export function useRoundAtTank() {
  const { t } = useI18n();
  const route = useRoute();
  const round = useRoundStore();
  const farms = useFarmsStore();
  const tanks = useTanksStore();
  const notice = ref<string | null>(null);

  async function open(raw: unknown): Promise<void> {
    notice.value = null;
    if (raw === undefined) return void (await round.start());
    const tankId = tankIdOf(raw);
    if (tankId === null) {
      notice.value = t('round.atTank.noTank');
      return void (await round.start());
    }
    // Tanks already on the round need no request, so a label scanned offline still works there.
    let farmId = round.rows.find((r) => r.tank.id === tankId)?.tank.farmId ?? null;
    let code: string | null = null;
    if (farmId === null) {
      try {
        const tank = await tanks.loadTank(tankId);
        farmId = tank.farmId;
        code = tank.code;
      } catch {
        // Not found, not granted or no connection: the round opens as usual and says so below.
      }
    }
    await farms.ensureLoaded();
    if (farmId !== null && round.farmOptions.some((f) => f.id === farmId)) await round.selectFarm(farmId);
    else await round.start();
    await nextTick();
    const row = round.rows.find((r) => r.tank.id === tankId);
    if (!row) {
      notice.value = code ? t('round.atTank.notOnRound', { code }) : t('round.atTank.labelNotOnRound');
      return;
    }
    const input = document.getElementById(`round-${tankId}-reading`);
    if (!input) return;
    const still = window.matchMedia?.('(prefers-reduced-motion: reduce)').matches ?? false;
    input.scrollIntoView?.({ behavior: still ? 'auto' : 'smooth', block: 'center' });
    input.focus({ preventScroll: true });
  }

  onMounted(() => void open(route.query.tank));
  // Scanning another label while the round is open changes only the query.
  watch(
    () => route.query.tank,
    (raw, before) => {
      if (raw !== before) void open(raw);
    },
  );
  return { notice };
}
