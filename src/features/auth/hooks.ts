import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { fetchMe, signIn, signOut, signUp, type Me } from './api';

export const authKeys = {
  me: ['auth', 'me'] as const,
};

export function useMe() {
  return useQuery({ queryKey: authKeys.me, queryFn: ({ signal }) => fetchMe(signal), staleTime: 60_000 });
}

/** The signed-in user's data; only for components rendered inside the signed-in shell. */
export function useSignedInMe(): Me {
  const { data } = useMe();
  if (!data) throw new Error('useSignedInMe used outside the signed-in shell');
  return data;
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
      // Whatever the server answered, this browser forgets everything it held for the session.
      queryClient.clear();
      queryClient.setQueryData(authKeys.me, null);
    },
  });
}
