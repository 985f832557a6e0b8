import { AppShell, Avatar, Burger, Group, Menu, NavLink, ScrollArea, Stack, Text, UnstyledButton } from '@mantine/core';
import { useDisclosure } from '@mantine/hooks';
import { ROLE_LABELS } from '@ostium/shared';
import { IconChevronDown, IconLogout } from '@tabler/icons-react';
import { Link, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { Brand } from '../components/brand';
import { useSignOut } from '../features/auth/api/sign-in';
import { useSession } from '../features/auth/use-session';
import { navFor } from './navigation';

const initials = (name: string) =>
  name
    .replace(/^Dr\.?\s+/i, '')
    .split(/\s+/)
    .map((p) => p[0])
    .slice(0, 2)
    .join('')
    .toUpperCase();

export function Shell() {
  const session = useSession()!;
  const [opened, { toggle, close }] = useDisclosure();
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut();
  const items = navFor(session.user.role);
  const section = (s: 'work' | 'admin') =>
    items
      .filter((i) => i.section === s)
      .map((i) => (
        <NavLink
          key={i.to}
          component={Link}
          to={i.to}
          label={i.label}
          leftSection={<i.icon size={18} stroke={1.6} />}
          active={i.to === '/' ? location.pathname === '/' : location.pathname.startsWith(i.to)}
          onClick={close}
          styles={{ root: { borderRadius: 'var(--mantine-radius-md)' } }}
        />
      ));
  const admin = section('admin');

  return (
    <AppShell header={{ height: 56 }} navbar={{ width: 232, breakpoint: 'sm', collapsed: { mobile: !opened } }} padding="lg">
      <AppShell.Header className="no-print" bg="white">
        <Group h="100%" px="md" justify="space-between">
          <Group gap="sm">
            <Burger opened={opened} onClick={toggle} hiddenFrom="sm" size="sm" aria-label="Open navigation" />
            <Brand />
          </Group>
          <Menu position="bottom-end" width={220}>
            <Menu.Target>
              <UnstyledButton aria-label="Account menu">
                <Group gap={8}>
                  <Avatar color="lagoon" radius="xl" size={32}>
                    {initials(session.user.name)}
                  </Avatar>
                  <Stack gap={0} visibleFrom="xs">
                    <Text fz="sm" fw={600} lh={1.2}>
                      {session.user.name}
                    </Text>
                    <Text fz="xs" c="dimmed" lh={1.2}>
                      {ROLE_LABELS[session.user.role]}
                    </Text>
                  </Stack>
                  <IconChevronDown size={14} />
                </Group>
              </UnstyledButton>
            </Menu.Target>
            <Menu.Dropdown>
              <Menu.Label>{session.user.email}</Menu.Label>
              <Menu.Item
                leftSection={<IconLogout size={16} />}
                onClick={async () => {
                  await signOut();
                  navigate('/sign-in');
                }}
              >
                Sign out
              </Menu.Item>
            </Menu.Dropdown>
          </Menu>
        </Group>
      </AppShell.Header>
      <AppShell.Navbar p="sm" className="no-print" bg="stone.0">
        <AppShell.Section grow component={ScrollArea}>
          <Stack gap={2} component="nav" aria-label="Main">
            {section('work')}
            {admin.length > 0 && (
              <>
                <Text fz={11} fw={700} c="stone.6" tt="uppercase" mt="md" mb={4} px="sm" style={{ letterSpacing: '0.08em' }}>
                  Administration
                </Text>
                {admin}
              </>
            )}
          </Stack>
        </AppShell.Section>
      </AppShell.Navbar>
      <AppShell.Main bg="stone.0">
        <Outlet />
      </AppShell.Main>
    </AppShell>
  );
}
