CREATE TABLE `computation_result` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`input_hash` varchar(64) NOT NULL,
	`quantity` varchar(60) NOT NULL,
	`engine_version` varchar(20) NOT NULL,
	`result_table` json NOT NULL,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	CONSTRAINT `computation_result_id` PRIMARY KEY(`id`),
	CONSTRAINT `computation_result_hash_unique` UNIQUE(`input_hash`)
);
--> statement-breakpoint
CREATE TABLE `computation` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`companion_id` bigint unsigned NOT NULL,
	`name` varchar(200) NOT NULL,
	`quantity` varchar(60) NOT NULL,
	`parameters` json NOT NULL,
	`ensemble_ids` json NOT NULL,
	`status` enum('queued','running','current','failed','cancelled') NOT NULL DEFAULT 'queued',
	`input_hash` varchar(64) NOT NULL,
	`result_id` bigint unsigned,
	`error` text,
	`progress` double NOT NULL DEFAULT 0,
	`progress_note` varchar(200) NOT NULL DEFAULT '',
	`attempts` int NOT NULL DEFAULT 0,
	`created_by` varchar(40),
	`started_at` datetime,
	`finished_at` datetime,
	`heartbeat_at` datetime,
	`created_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP,
	`updated_at` timestamp NOT NULL DEFAULT CURRENT_TIMESTAMP ON UPDATE CURRENT_TIMESTAMP,
	CONSTRAINT `computation_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `computation` ADD CONSTRAINT `computation_companion_id_companion_id_fk` FOREIGN KEY (`companion_id`) REFERENCES `companion`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `computation` ADD CONSTRAINT `computation_created_by_user_id_fk` FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `computation_companion_idx` ON `computation` (`companion_id`);--> statement-breakpoint
CREATE INDEX `computation_status_idx` ON `computation` (`status`);