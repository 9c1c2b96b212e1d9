import { computed } from 'vue';
import { useRouter } from 'vue-router';
import { useSessionStore } from '@/stores/session';
import { groupNavItems, visibleNavItems, type NavItem } from '@/navigation';

/** The navigation the signed-in user may use, among the areas whose routes exist. */
export function useNavigation() {
  const router = useRouter();
  const session = useSessionStore();
  const items = computed<NavItem[]>(() => visibleNavItems(session.can, (name) => router.hasRoute(name)));
  const groups = computed(() => groupNavItems(items.value));
  return { items, groups };
}
