import { Alert, Box, Button, Card, Center, PasswordInput, Stack, Text, TextInput, Title } from '@mantine/core';
import { useForm } from '@mantine/form';
import { Navigate, useLocation } from 'react-router-dom';
import { Brand } from '../../../components/brand';
import { ApiError } from '../../../lib/api-client';
import { useSignIn } from '../api/sign-in';
import { useSession } from '../use-session';

export function SignInPage() {
  const session = useSession();
  const location = useLocation();
  const signIn = useSignIn();
  const form = useForm({
    initialValues: { email: '', password: '' },
    validate: {
      email: (v) => (/^\S+@\S+$/.test(v.trim()) ? null : 'Enter your e-mail address'),
      password: (v) => (v ? null : 'Enter your password'),
    },
  });
  const from = (location.state as { from?: string } | null)?.from ?? '/';
  if (session) return <Navigate to={from} replace />;
  const error = signIn.error instanceof ApiError ? signIn.error.message : signIn.error ? 'Sign-in failed' : null;

  return (
    <Center mih="100vh" bg="stone.1" p="md">
      <Card w={400} shadow="sm" padding="xl">
        <Stack gap="lg">
          <Brand />
          <Box>
            <Title order={2} fz={22}>
              Sign in
            </Title>
            <Text c="dimmed" fz="sm">
              Referrals, case sheets and the chair board for your practice.
            </Text>
          </Box>
          <form onSubmit={form.onSubmit((v) => signIn.mutate({ email: v.email.trim(), password: v.password }))} noValidate>
            <Stack gap="sm">
              <TextInput label="E-mail" type="email" autoComplete="username" autoFocus {...form.getInputProps('email')} />
              <PasswordInput label="Password" autoComplete="current-password" {...form.getInputProps('password')} />
              {error && (
                <Alert color="red" variant="light" role="alert">
                  {error}
                </Alert>
              )}
              <Button type="submit" loading={signIn.isPending} fullWidth mt="xs">
                Sign in
              </Button>
            </Stack>
          </form>
        </Stack>
      </Card>
    </Center>
  );
}
