import { createContext, useContext } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { fetchMe, signIn, signOut, signUp, type Me } from './api';

export const authKeys = {
  me: ['auth', 'me'] as const,
};

export function useMe() {
  return useQuery({ queryKey: authKeys.me, queryFn: ({ signal }) => fetchMe(signal), staleTime: 60_000 });
}

/**
 * The signed-in user as the shell last rendered it. The shell (RequireAuth) provides it, so components
 * inside keep a consistent value while a sign-out takes the shell away, instead of each seeing "no user".
 */
export const SignedInMeContext = createContext<Me | null>(null);

/** The signed-in user's data; only for components rendered inside the signed-in shell. */
export function useSignedInMe(): Me {
  const fromShell = useContext(SignedInMeContext);
  const { data } = useMe();
  const me = data ?? fromShell;
  if (!me) throw new Error('useSignedInMe used outside the signed-in shell');
  return me;
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: async () => {
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      await queryClient.fetchQuery({ queryKey: authKeys.me, queryFn: ({ signal }) => fetchMe(signal), staleTime: 0 });
    },
  });
}

export function useSignUp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signUp,
    onSuccess: async () => {
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      await queryClient.fetchQuery({ queryKey: authKeys.me, queryFn: ({ signal }) => fetchMe(signal), staleTime: 0 });
    },
  });
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      // Whatever the server answered, this browser forgets everything it held for the session. "Signed
      // out" first, so the shell leaves for /sign-in before anything it shows loses its data.
      queryClient.setQueryData(authKeys.me, null);
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authKeys.me[0] });
    },
  });
}
