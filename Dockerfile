# veer service image: one image, two commands (API: `npm run api`; worker: `npm run worker`).
# TypeScript runs through tsx (the project's runtime for .ts sources), so only the browser console is built.

# Stage 1: build the browser console (vite is a dev dependency).
FROM node:20-bookworm-slim AS console-build
WORKDIR /app
RUN apt-get update -q && apt-get install -y -q --no-install-recommends python3 make g++ && rm -rf /var/lib/apt/lists/*
COPY package.json package-lock.json ./
RUN npm ci
COPY . .
RUN npm run console:build

# Stage 2: runtime with production dependencies only (tsx is one of them).
FROM node:20-bookworm-slim
WORKDIR /app
ENV NODE_ENV=production
# better-sqlite3 ships prebuilt binaries for this platform; the build tools are the fallback.
RUN apt-get update -q && apt-get install -y -q --no-install-recommends python3 make g++ && rm -rf /var/lib/apt/lists/*
COPY package.json package-lock.json ./
RUN npm ci --omit=dev && npm cache clean --force
COPY . .
COPY --from=console-build /app/console/dist ./console/dist

RUN mkdir -p /data && chown node:node /data
USER node
ENV DATA_DIR=/data PORT=8080
EXPOSE 8080

CMD ["npm", "run", "api"]
