import { useMutation, useQueryClient } from "@tanstack/react-query";
import { notificationChoicesSchema, type NotificationKind } from "@shared/schemas/notification";
import { api } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

export const notificationQueries = {
  all: () => ["notifications"] as const,
  choices: () =>
    getQuery([...notificationQueries.all(), "choices"], "/api/notifications/choices", notificationChoicesSchema),
};

export function useSetNotificationChoices() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (on: NotificationKind[]) => api.put("/api/notifications/choices", { on }, notificationChoicesSchema),
    onSuccess: (data) => queryClient.setQueryData(notificationQueries.choices().queryKey, data),
  });
}
