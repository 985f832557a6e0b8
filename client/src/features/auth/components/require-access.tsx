import { Button, Center, Stack, Text, Title } from '@mantine/core';
import { can, type Capability } from '@ostium/shared';
import type { ReactNode } from 'react';
import { Link, Navigate, useLocation } from 'react-router-dom';
import { useSession } from '../use-session';

/** Route guard: signed out → the sign-in page (coming back here after); wrong role → a clear refusal. */
export function RequireAccess({ capability, children }: { capability?: Capability; children: ReactNode }) {
  const session = useSession();
  const location = useLocation();
  if (!session) return <Navigate to="/sign-in" replace state={{ from: location.pathname + location.search }} />;
  if (capability && !can(session.user.role, capability)) {
    return (
      <Center py={80}>
        <Stack align="center" gap="xs">
          <Title order={3}>Not available for your role</Title>
          <Text c="dimmed">Ask an administrator if you need access to this page.</Text>
          <Button component={Link} to="/" variant="light">
            Back to Today
          </Button>
        </Stack>
      </Center>
    );
  }
  return <>{children}</>;
}
