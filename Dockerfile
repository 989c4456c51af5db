# veer service image: one image, two commands (API: `node dist/api/main.js`; worker: `node dist/queue/worker-main.js`).

# Stage 1: `npm ci` compiles the TypeScript to dist/ and builds the browser console (its `prepare` step, with the
# dev dependencies typescript and vite), then the dev dependencies are pruned away.
FROM node:20-bookworm-slim AS build
WORKDIR /app
# better-sqlite3 ships prebuilt binaries for this platform; the build tools are the fallback.
RUN apt-get update -q && apt-get install -y -q --no-install-recommends python3 make g++ && rm -rf /var/lib/apt/lists/*
COPY . .
RUN npm ci && npm prune --omit=dev && npm cache clean --force

# Stage 2: runtime: production dependencies and the built files only; plain node, no TypeScript loader.
FROM node:20-bookworm-slim
WORKDIR /app
ENV NODE_ENV=production
COPY --from=build /app/package.json /app/package-lock.json ./
COPY --from=build /app/node_modules ./node_modules
COPY --from=build /app/dist ./dist
COPY --from=build /app/bin ./bin
COPY --from=build /app/console/dist ./console/dist
COPY --from=build /app/examples ./examples

RUN mkdir -p /data && chown node:node /data
USER node
ENV DATA_DIR=/data PORT=8080
EXPOSE 8080

CMD ["node", "dist/api/main.js"]
