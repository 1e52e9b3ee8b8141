import type { AppDeps } from "../../deps";
import { idParams } from "../../contracts/common";
import { createDeviceRequest, deviceList, deviceView, listDevicesQuery, updateDeviceRequest } from "../../contracts/devices";
import { ApiRouter, type RouteModule } from "../../http/api-router";
import { createDevice, getDevice, listDevices, updateDevice } from "./devices.service";

export function devicesRouter(deps: AppDeps): ApiRouter {
  return new ApiRouter("/api/devices", deps)
    .endpoint({
      method: "get",
      path: "/",
      summary: "Sensors with the assignment in force now",
      access: { scopes: ["devices:read"] },
      request: { query: listDevicesQuery },
      response: deviceList,
      handler: ({ query }) => listDevices(deps, query),
    })
    .endpoint({
      method: "post",
      path: "/",
      summary: "Register a sensor",
      access: { scopes: ["devices:write"] },
      status: 201,
      request: { body: createDeviceRequest },
      response: deviceView,
      handler: ({ body }, req) => createDevice(deps, body, req),
    })
    .endpoint({
      method: "get",
      path: "/:id",
      summary: "One sensor",
      access: { scopes: ["devices:read"] },
      request: { params: idParams },
      response: deviceView,
      handler: ({ params }) => getDevice(deps, params.id),
    })
    .endpoint({
      method: "patch",
      path: "/:id",
      summary: "Change a sensor's status, firmware or notes",
      access: { scopes: ["devices:write"] },
      request: { params: idParams, body: updateDeviceRequest },
      response: deviceView,
      handler: ({ params, body }, req) => updateDevice(deps, params.id, body, req),
    });
}

export const devicesRoutes: RouteModule = { prefix: "/api/devices", router: devicesRouter };
