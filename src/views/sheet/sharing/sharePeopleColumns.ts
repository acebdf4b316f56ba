import { h } from 'vue';
import { NButton, NSelect, type DataTableColumns } from 'naive-ui';
import { SHARE_ROLES, type ShareRole } from '@shared/api/rights';
import type { SheetPerson } from '@/api/shares';

export interface PeopleActions {
  changeRole(person: SheetPerson, role: ShareRole): void;
  revoke(person: SheetPerson): void;
  transfer(person: SheetPerson): void;
  /** The caller may share (change roles, revoke, transfer). */
  mayShare: boolean;
}

const roleOptions = SHARE_ROLES.map((value) => ({ value, label: value }));

/** The people table of the sharing dialog: name, e-mail, role (a select for the owner to change), actions. */
export function peopleColumns(actions: PeopleActions): DataTableColumns<SheetPerson> {
  const editable = (person: SheetPerson) => actions.mayShare && person.role !== 'owner';
  return [
    { title: 'Name', key: 'name' },
    { title: 'E-mail', key: 'email' },
    {
      title: 'Role',
      key: 'role',
      render: (person) =>
        editable(person)
          ? h(NSelect, {
              value: person.role,
              options: roleOptions,
              size: 'small',
              style: 'width: 8.5rem',
              'aria-label': `Role of ${person.name}`,
              'onUpdate:value': (role: ShareRole) => actions.changeRole(person, role),
            })
          : person.role,
    },
    {
      title: 'Actions',
      key: 'actions',
      render: (person) =>
        editable(person)
          ? h('span', { class: 'share-actions' }, [
              h(
                NButton,
                {
                  size: 'tiny',
                  secondary: true,
                  disabled: person.role !== 'editor',
                  title: person.role === 'editor' ? undefined : 'Only an editor can become the owner',
                  'aria-label': `Make ${person.name} the owner`,
                  onClick: () => actions.transfer(person),
                },
                () => 'Make owner',
              ),
              h(
                NButton,
                {
                  size: 'tiny',
                  quaternary: true,
                  type: 'error',
                  'aria-label': `Revoke ${person.name}`,
                  onClick: () => actions.revoke(person),
                },
                () => 'Revoke',
              ),
            ])
          : null,
    },
  ];
}
