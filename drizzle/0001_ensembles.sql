CREATE TABLE `api_token` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`created_by` varchar(40) NOT NULL,
	`name` varchar(120) NOT NULL,
	`prefix` varchar(16) NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`scopes` json NOT NULL,
	`last_used_at` datetime,
	`revoked_at` datetime,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `api_token_id` PRIMARY KEY(`id`),
	CONSTRAINT `api_token_hash_unique` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `ensemble_configuration` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`ensemble_id` bigint unsigned NOT NULL,
	`position` int NOT NULL,
	`n` int NOT NULL,
	`d` int NOT NULL,
	`checksum` varchar(64) NOT NULL,
	`bbox` json NOT NULL,
	`min_distance` double,
	`labels` json NOT NULL,
	CONSTRAINT `ensemble_configuration_id` PRIMARY KEY(`id`),
	CONSTRAINT `configuration_position_unique` UNIQUE(`ensemble_id`,`position`)
);
--> statement-breakpoint
CREATE TABLE `ensemble` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`name` varchar(200) NOT NULL,
	`description` text NOT NULL,
	`file_name` varchar(255) NOT NULL,
	`format` enum('text','json','npy','zip') NOT NULL,
	`sha256` varchar(64) NOT NULL,
	`size_bytes` bigint unsigned NOT NULL,
	`object_key` varchar(200) NOT NULL,
	`d` int NOT NULL,
	`configuration_count` int NOT NULL,
	`point_count` bigint unsigned NOT NULL,
	`setting` json NOT NULL,
	`uploaded_by` varchar(40),
	`revision` varchar(40) NOT NULL,
	`preview` json,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `ensemble_id` PRIMARY KEY(`id`),
	CONSTRAINT `ensemble_companion_sha_unique` UNIQUE(`companion_id`,`sha256`)
);
--> statement-breakpoint
ALTER TABLE `api_token` ADD CONSTRAINT `api_token_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `api_token` ADD CONSTRAINT `api_token_created_by_user_id_fk` FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `ensemble_configuration` ADD CONSTRAINT `ensemble_configuration_ensemble_id_ensemble_id_fk` FOREIGN KEY (`ensemble_id`) REFERENCES `ensemble`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `ensemble` ADD CONSTRAINT `ensemble_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `ensemble` ADD CONSTRAINT `ensemble_uploaded_by_user_id_fk` FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `api_token_companion_idx` ON `api_token` (`companion_id`);--> statement-breakpoint
CREATE INDEX `ensemble_companion_idx` ON `ensemble` (`companion_id`);