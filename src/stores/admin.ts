import { defineStore } from 'pinia';
import { ref } from 'vue';
import * as adminApi from '@/api/admin';
import type { AdminUser } from '@/api/admin';
import type { SiteRole } from '@/api/auth';
import { errorMessage } from '@/api/http';

/** The admin page's user table: remote search and paging, and role changes. */
export const useAdminStore = defineStore('admin', () => {
  const users = ref<AdminUser[]>([]);
  const total = ref(0);
  const search = ref('');
  const page = ref(1);
  const pageSize = ref(20);
  const loading = ref(false);
  const error = ref<string | null>(null);
  /** Id of the user whose role is being saved. */
  const savingRoleFor = ref<string | null>(null);
  // Answers can arrive out of order while someone types; only the latest request may win.
  let latestRequest = 0;

  async function fetchUsers(): Promise<void> {
    const requestNumber = ++latestRequest;
    loading.value = true;
    try {
      const answer = await adminApi.listUsers({
        search: search.value,
        page: page.value,
        pageSize: pageSize.value,
      });
      if (requestNumber !== latestRequest) return;
      users.value = answer.users;
      total.value = answer.total;
      error.value = null;
    } catch (cause) {
      if (requestNumber === latestRequest) error.value = errorMessage(cause);
    } finally {
      if (requestNumber === latestRequest) loading.value = false;
    }
  }

  function setSearch(text: string): Promise<void> {
    search.value = text;
    page.value = 1;
    return fetchUsers();
  }

  function setPage(next: number): Promise<void> {
    page.value = next;
    return fetchUsers();
  }

  function setPageSize(next: number): Promise<void> {
    pageSize.value = next;
    page.value = 1;
    return fetchUsers();
  }

  /** Saves a role; throws the server's error (e.g. demoting the last admin) for the page to show. */
  async function setRole(userId: string, role: SiteRole): Promise<void> {
    savingRoleFor.value = userId;
    try {
      await adminApi.setUserRole(userId, role);
      users.value = users.value.map((user) => (user.id === userId ? { ...user, role } : user));
    } finally {
      savingRoleFor.value = null;
    }
  }

  return {
    users,
    total,
    search,
    page,
    pageSize,
    loading,
    error,
    savingRoleFor,
    fetchUsers,
    setSearch,
    setPage,
    setPageSize,
    setRole,
  };
});
