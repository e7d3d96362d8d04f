import { createMongoAbility, type MongoAbility, type RawRuleOf } from '@casl/ability';
import { AbilityProvider as CaslAbilityProvider, Can as CaslCan, useAbility } from '@casl/react';
import { createElement, type ReactNode } from 'react';

/**
 * The server sends its CASL rules in `/api/me`; the client builds the same ability from them only to
 * shape the screen (which links and buttons appear). The server still checks every request.
 */
export type AppAbility = MongoAbility;
export type AppRawRule = RawRuleOf<AppAbility>;

export function buildAbility(rules: AppRawRule[]): AppAbility {
  return createMongoAbility<AppAbility>(rules);
}

/** Signed-out screens get an ability that allows nothing. */
export const emptyAbility: AppAbility = createMongoAbility<AppAbility>([]);

// @casl/react 7 replaced `createContextualCan` with a provider, `Can` and `useAbility`; these wrappers
// pin them to AppAbility so call sites stay typed.
export function AbilityContext({ ability, children }: { ability: AppAbility; children: ReactNode }) {
  return createElement(CaslAbilityProvider<AppAbility>, { value: ability, children });
}

export const Can = CaslCan<AppAbility>;

export function useAppAbility(): AppAbility {
  return useAbility<AppAbility>();
}
