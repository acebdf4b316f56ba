import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { VueWrapper } from '@vue/test-utils';
import * as adminApi from '@/api/admin';
import * as authApi from '@/api/auth';
import { ApiError } from '@/api/http';
import { mountAt } from './harness';

vi.mock('@/api/auth', () => ({ fetchCurrentUser: vi.fn(), signOut: vi.fn() }));
vi.mock('@/api/admin', () => ({ listUsers: vi.fn(), setUserRole: vi.fn() }));

const auth = vi.mocked(authApi);
const api = vi.mocked(adminApi);
const admin = { id: 'a1', email: 'june.delta@example.test', name: 'June Delta', role: 'admin' as const };
const people = [
  {
    id: 'a1',
    email: 'june.delta@example.test',
    name: 'June Delta',
    role: 'admin' as const,
    createdAt: new Date('2026-01-05T08:00:00Z'),
  },
  {
    id: 'm2',
    email: 'kai.weir@example.test',
    name: 'Kai Weir',
    role: 'member' as const,
    createdAt: new Date('2026-02-11T08:00:00Z'),
  },
];
let wrapper: VueWrapper | undefined;

beforeEach(() => {
  vi.clearAllMocks();
});
afterEach(() => {
  wrapper?.unmount();
  document.body.innerHTML = '';
});

describe('admin page', () => {
  it('sends a member to the "admins only" page without asking for the user list', async () => {
    auth.fetchCurrentUser.mockResolvedValue({ ...admin, id: 'm2', role: 'member' });
    const mounted = await mountAt('/admin');
    wrapper = mounted.wrapper;
    await vi.waitFor(() => expect(document.body.textContent).toContain('Admins only'));
    expect(mounted.router.currentRoute.value.name).toBe('admins-only');
    expect(api.listUsers).not.toHaveBeenCalled();
  });

  it('lists users with a labelled role select and saves a role change', async () => {
    auth.fetchCurrentUser.mockResolvedValue(admin);
    api.listUsers.mockResolvedValue({ users: people, total: 2 });
    api.setUserRole.mockResolvedValue(undefined);
    ({ wrapper } = await mountAt('/admin'));
    await vi.waitFor(() => expect(document.body.textContent).toContain('kai.weir@example.test'));
    expect(api.listUsers).toHaveBeenCalledWith({ search: '', page: 1, pageSize: 20 });
    const select = document.querySelector<HTMLSelectElement>('select[aria-label="Role of Kai Weir"]')!;
    expect(select.value).toBe('member');
    select.value = 'admin';
    select.dispatchEvent(new Event('change'));
    await vi.waitFor(() => expect(api.setUserRole).toHaveBeenCalledWith('m2', 'admin'));
    await vi.waitFor(() =>
      expect(document.querySelector<HTMLSelectElement>('select[aria-label="Role of Kai Weir"]')!.value).toBe(
        'admin',
      ),
    );
  });

  it('keeps the old role shown when the server refuses the change', async () => {
    auth.fetchCurrentUser.mockResolvedValue(admin);
    api.listUsers.mockResolvedValue({ users: people, total: 2 });
    api.setUserRole.mockRejectedValue(
      new ApiError({ status: 409, code: 'admin.last_admin', message: 'The last admin cannot be demoted.' }),
    );
    ({ wrapper } = await mountAt('/admin'));
    await vi.waitFor(() => expect(document.body.textContent).toContain('June Delta'));
    const select = document.querySelector<HTMLSelectElement>('select[aria-label="Role of June Delta"]')!;
    select.value = 'member';
    select.dispatchEvent(new Event('change'));
    await vi.waitFor(() => expect(document.body.textContent).toContain('The last admin cannot be demoted.'));
    expect(document.querySelector<HTMLSelectElement>('select[aria-label="Role of June Delta"]')!.value).toBe(
      'admin',
    );
  });

  it('searches on the server as the admin types', async () => {
    auth.fetchCurrentUser.mockResolvedValue(admin);
    api.listUsers.mockResolvedValue({ users: people, total: 2 });
    ({ wrapper } = await mountAt('/admin'));
    await vi.waitFor(() => expect(api.listUsers).toHaveBeenCalledTimes(1));
    api.listUsers.mockResolvedValue({ users: [people[1]!], total: 1 });
    const search = document.querySelector<HTMLInputElement>('input[type="search"]')!;
    search.value = 'weir';
    search.dispatchEvent(new Event('input'));
    await vi.waitFor(
      () => expect(api.listUsers).toHaveBeenLastCalledWith({ search: 'weir', page: 1, pageSize: 20 }),
      { timeout: 3000 },
    );
    await vi.waitFor(() => expect(document.body.textContent).not.toContain('june.delta@example.test'));
  });
});
