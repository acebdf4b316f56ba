import { h } from 'vue';
import type { DataTableColumns } from 'naive-ui';
import type { AdminUser } from '@/api/admin';
import type { SiteRole } from '@/api/auth';
import { formatDate } from '@/components/common/format';
import RoleSelect from './RoleSelect.vue';

/** Columns of the admin user table; the role column edits through `onRoleChange`. */
export function userColumns(options: {
  onRoleChange: (user: AdminUser, role: SiteRole) => void;
  isSaving: (user: AdminUser) => boolean;
}): DataTableColumns<AdminUser> {
  return [
    { title: 'Name', key: 'name', ellipsis: { tooltip: true } },
    { title: 'Email', key: 'email', ellipsis: { tooltip: true } },
    {
      title: 'Role',
      key: 'role',
      width: 130,
      render: (user) =>
        h(RoleSelect, {
          role: user.role,
          userName: user.name,
          disabled: options.isSaving(user),
          onChange: (role: SiteRole) => options.onRoleChange(user, role),
        }),
    },
    {
      title: 'Joined',
      key: 'createdAt',
      width: 140,
      render: (user) => h('time', { datetime: user.createdAt.toISOString() }, formatDate(user.createdAt)),
    },
  ];
}
