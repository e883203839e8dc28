import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import { z } from 'zod';
import { api, ApiError } from '@/api/client';
import { meSchema, type Me, type SignIn, type SignUp } from '@shared/model/auth';
import type { Role } from '@shared/model/roles';

const TEAM_KEY = 'shockwright.team';

/** Who is signed in, their teams, and which team the app is looking at. */
export const useSessionStore = defineStore('session', () => {
  const me = ref<Me | null>(null);
  const loaded = ref(false);
  const selectedTeamId = ref<string | null>(localStorage.getItem(TEAM_KEY));

  const user = computed(() => me.value?.user ?? null);
  const teams = computed(() => me.value?.teams ?? []);
  const currentTeam = computed(() => teams.value.find((t) => t.teamId === selectedTeamId.value) ?? teams.value[0] ?? null);
  const role = computed<Role | null>(() => currentTeam.value?.role ?? null);

  function accept(value: Me | null) {
    me.value = value;
    loaded.value = true;
  }

  async function load(): Promise<void> {
    try {
      accept(await api.get('/api/auth/me', meSchema));
    } catch (err) {
      if (err instanceof ApiError && err.status === 401) accept(null);
      else throw err;
    }
  }

  async function signIn(body: SignIn): Promise<void> {
    accept(await api.post('/api/auth/sign-in', body, meSchema));
  }

  /**
   * Sign-up, step one: answers with what to do next (check the inbox). The account exists once
   * the link in the e-mail is followed (`confirmSignUp`).
   */
  async function signUp(body: SignUp): Promise<string> {
    return (await api.post('/api/auth/sign-up', body, z.object({ message: z.string() }))).message;
  }

  /** Sign-up, step two: the link's token; creates the account and signs it in. */
  async function confirmSignUp(token: string): Promise<void> {
    const value = await api.post('/api/auth/sign-up/confirm', { token }, meSchema);
    accept(value);
    selectTeam(value.teams[0]?.teamId ?? null);
  }

  async function signOut(): Promise<void> {
    await api.post('/api/auth/sign-out');
    accept(null);
  }

  /** Creates a team owned by the signed-in user and switches to it. */
  async function createTeam(name: string): Promise<void> {
    const team = await api.post<{ teamId: string }>('/api/teams', { name });
    await load();
    selectTeam(team.teamId);
  }

  /** After accepting an invitation or a reset: take the fresh answer and look at `teamId`. */
  function adopt(value: Me, teamId?: string) {
    accept(value);
    if (teamId) selectTeam(teamId);
  }

  function selectTeam(teamId: string | null) {
    selectedTeamId.value = teamId;
    if (teamId) localStorage.setItem(TEAM_KEY, teamId);
    else localStorage.removeItem(TEAM_KEY);
  }

  return { me, loaded, user, teams, currentTeam, role, load, signIn, signUp, confirmSignUp, signOut, selectTeam, createTeam, adopt };
});
