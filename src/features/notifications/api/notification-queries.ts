import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import { notificationChoicesSchema, type NotificationKind } from "@shared/schemas/notification";
import { api } from "@/lib/api-client";

export const notificationQueries = {
  all: () => ["notifications"] as const,
  choices: () =>
    queryOptions({
      queryKey: [...notificationQueries.all(), "choices"] as const,
      queryFn: () => api.get("/api/notifications/choices", notificationChoicesSchema),
    }),
};

export function useSetNotificationChoices() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (on: NotificationKind[]) => api.put("/api/notifications/choices", { on }, notificationChoicesSchema),
    onSuccess: (data) => queryClient.setQueryData(notificationQueries.choices().queryKey, data),
  });
}
