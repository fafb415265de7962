"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { phaseMapKeys } from "@/lib/client/query-keys";
import { useSearchParams } from "next/navigation";
import { useMemo } from "react";
import { fetchJson } from "@/lib/client/fetch-json";
import { filterParams, type MineralOption, type PhaseMapData } from "@/lib/phase-map";

/** The filter in the URL (register filters + phase filters), as a query string without paging. */
export function usePhaseFilterQuery(): { query: string; params: Record<string, string> } {
  const search = useSearchParams();
  const key = search.toString();
  return useMemo(() => {
    const params = filterParams(new URLSearchParams(key));
    delete params.sort;
    delete params.dir;
    return { query: new URLSearchParams(params).toString(), params };
  }, [key]);
}

export function usePhaseMap(projectId: string, query: string) {
  return useQuery({
    queryKey: phaseMapKeys.map(projectId, query),
    queryFn: () => fetchJson<PhaseMapData>(`/api/projects/${projectId}/phase-map?${query}`),
    placeholderData: keepPreviousData,
  });
}

/** Minerals for the filter: the register filter without the mineral/group/phase part (so switching minerals reuses it). */
export function useMineralOptions(projectId: string, params: Record<string, string>) {
  const rest = { ...params };
  delete rest.mineral;
  delete rest.group;
  delete rest.phase;
  const q = new URLSearchParams(rest).toString();
  return useQuery({
    queryKey: phaseMapKeys.minerals(projectId, q),
    queryFn: () => fetchJson<{ items: MineralOption[] }>(`/api/projects/${projectId}/phase-map/minerals?${q}`),
    staleTime: 60_000,
  });
}
