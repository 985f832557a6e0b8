import { Alert, Badge, Button, Card, Group, Modal, PasswordInput, Select, Stack, Switch, Table, Text, TextInput } from '@mantine/core';
import { useForm } from '@mantine/form';
import { useDisclosure } from '@mantine/hooks';
import { notifications } from '@mantine/notifications';
import { ROLE_LABELS, ROLES, type Role } from '@ostium/shared';
import { IconUserPlus } from '@tabler/icons-react';
import { PageHeader } from '../../../components/page-header';
import { QueryState } from '../../../components/query-state';
import { ApiError } from '../../../lib/api-client';
import { useSession } from '../../auth/use-session';
import { useCreateUser, useUpdateUser, useUsers } from '../api/users';

const roleOptions = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString([], { dateStyle: 'medium', timeStyle: 'short' }) : 'never');

export function UsersPage() {
  const users = useUsers();
  const update = useUpdateUser();
  const me = useSession()!.user;
  const [opened, { open, close }] = useDisclosure(false);

  const change = (id: number, body: { role?: Role; active?: boolean }, what: string) =>
    update.mutate(
      { id, ...body },
      {
        onSuccess: (u) => notifications.show({ color: 'lagoon', message: `${u.name}: ${what}` }),
        onError: (e) => notifications.show({ color: 'red', title: 'Not changed', message: (e as Error).message }),
      },
    );

  return (
    <>
      <PageHeader
        title="Users and roles"
        description="Who can sign in, and what each role may do. Changing a role or deactivating someone signs them out at once."
        actions={
          <Button leftSection={<IconUserPlus size={16} />} onClick={open}>
            New user
          </Button>
        }
      />
      <Card p={0}>
        <QueryState query={users}>
          {(list) => (
            <Table.ScrollContainer minWidth={720}>
              <Table>
                <Table.Thead>
                  <Table.Tr>
                    <Table.Th>Name</Table.Th>
                    <Table.Th>E-mail</Table.Th>
                    <Table.Th w={200}>Role</Table.Th>
                    <Table.Th>Last sign-in</Table.Th>
                    <Table.Th w={110}>Active</Table.Th>
                  </Table.Tr>
                </Table.Thead>
                <Table.Tbody>
                  {list.map((u) => (
                    <Table.Tr key={u.id} c={u.active ? undefined : 'dimmed'}>
                      <Table.Td fw={600}>
                        {u.name} {u.id === me.id && <Badge size="xs" ml={4}>you</Badge>}
                      </Table.Td>
                      <Table.Td>{u.email}</Table.Td>
                      <Table.Td>
                        <Select
                          aria-label={`Role of ${u.name}`}
                          size="xs"
                          data={roleOptions}
                          value={u.role}
                          disabled={u.id === me.id}
                          allowDeselect={false}
                          onChange={(v) => v && v !== u.role && change(u.id, { role: v as Role }, `now ${ROLE_LABELS[v as Role]}`)}
                        />
                      </Table.Td>
                      <Table.Td fz="sm">{when(u.lastSignInAt)}</Table.Td>
                      <Table.Td>
                        <Switch
                          aria-label={`${u.name} active`}
                          checked={u.active}
                          disabled={u.id === me.id}
                          onChange={(e) => change(u.id, { active: e.currentTarget.checked }, e.currentTarget.checked ? 'reactivated' : 'deactivated')}
                        />
                      </Table.Td>
                    </Table.Tr>
                  ))}
                </Table.Tbody>
              </Table>
            </Table.ScrollContainer>
          )}
        </QueryState>
      </Card>
      <Modal opened={opened} onClose={close} title="New user" centered>
        <NewUserForm onDone={close} />
      </Modal>
    </>
  );
}

function NewUserForm({ onDone }: { onDone: () => void }) {
  const create = useCreateUser();
  const form = useForm({
    initialValues: { name: '', email: '', role: 'frontdesk' as Role, password: '' },
    validate: {
      name: (v) => (v.trim() ? null : 'Enter a name'),
      email: (v) => (/^\S+@\S+\.\S+$/.test(v.trim()) ? null : 'Enter an e-mail address'),
      password: (v) => (v.length >= 10 ? null : 'At least 10 characters'),
    },
  });
  const err = create.error instanceof ApiError ? create.error : null;
  return (
    <form
      onSubmit={form.onSubmit((v) =>
        create.mutate(v, {
          onSuccess: (u) => {
            notifications.show({ color: 'lagoon', message: `${u.name} can now sign in as ${ROLE_LABELS[u.role]}` });
            onDone();
          },
          onError: (e) => e instanceof ApiError && e.errors.forEach((f) => form.setFieldError(f.field, f.message)),
        }),
      )}
    >
      <Stack gap="sm">
        <TextInput label="Name" {...form.getInputProps('name')} data-autofocus />
        <TextInput label="E-mail" type="email" {...form.getInputProps('email')} />
        <Select label="Role" data={roleOptions} allowDeselect={false} {...form.getInputProps('role')} />
        <PasswordInput label="First password" description="They can be given a new one later." {...form.getInputProps('password')} />
        {err && !err.errors.length && (
          <Alert color="red" variant="light">
            {err.message}
          </Alert>
        )}
        <Group justify="flex-end">
          <Text fz="xs" c="dimmed" mr="auto">
            Every change is kept in the audit log.
          </Text>
          <Button type="submit" loading={create.isPending}>
            Create
          </Button>
        </Group>
      </Stack>
    </form>
  );
}
